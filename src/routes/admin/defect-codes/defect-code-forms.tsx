import { useState } from 'react';
import { defectCodeBody, updateDefectCodeBody } from '../../../../shared/schemas/ncr';
import { useCreateDefectCode } from '../../../api/defect-codes/create-defect-code';
import type { DefectCode } from '../../../api/defect-codes/defect-codes';
import { useUpdateDefectCode } from '../../../api/defect-codes/update-defect-code';
import { ConfirmDialog } from '../../../components/confirm-dialog';
import { Form, SubmitButton } from '../../../components/form';
import { TextField } from '../../../components/form-fields';
import { Button } from '../../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../../components/ui/card';
import { Dialog, DialogActions } from '../../../components/ui/dialog';
import { Notice } from '../../../components/ui/notice';

/** Adding stays on the page, above the list: codes are short and often added a few at a time. */
export function AddDefectCode() {
  const create = useCreateDefectCode();
  const [added, setAdded] = useState<DefectCode | null>(null);
  // a fresh form after each code, so the next one starts empty (and untouched: no focus is forced into
  // it, since leaving an empty field would show its error and push the list down)
  const [round, setRound] = useState(0);
  return (
    <Card labelledBy="add-code-heading">
      <CardHeader
        id="add-code-heading"
        title="Add a code"
        description="It is offered at once to everyone raising a concern."
      />
      <CardBody>
        <div className="flex flex-col gap-3">
          {added && (
            <Notice tone="ok" live="status">
              Added <span className="font-mono font-semibold">{added.code}</span> — {added.description}.
            </Notice>
          )}
          <Form
            key={round}
            schema={defectCodeBody}
            defaultValues={{ code: '', description: '' }}
            onSubmit={async (values) => {
              setAdded(null);
              setAdded(await create.mutateAsync(values));
              setRound((r) => r + 1);
            }}
          >
            <div className="grid grid-cols-1 items-start gap-4 md:grid-cols-[16rem_minmax(0,1fr)_auto]">
              <TextField
                name="code"
                label="Code"
                mono
                hint="2–20 letters, digits or dashes, e.g. THREAD. It cannot be changed later."
              />
              <TextField
                name="description"
                label="Description"
                hint="What the defect is, in the words people on the floor use."
              />
              <div className="md:pt-6">
                <SubmitButton>Add code</SubmitButton>
              </div>
            </div>
          </Form>
        </div>
      </CardBody>
    </Card>
  );
}

export function EditDefectCodeDialog({ code, onClose }: { code: DefectCode; onClose: () => void }) {
  const update = useUpdateDefectCode();
  return (
    <Dialog
      open
      onClose={onClose}
      title={`Edit defect code ${code.code}`}
      description="The code itself stays as it is. NCRs that already name it show the new wording."
    >
      <Form
        schema={updateDefectCodeBody}
        defaultValues={{ description: code.description }}
        onSubmit={async (values) => {
          await update.mutateAsync({ code: code.code, ...values });
          onClose();
        }}
      >
        <TextField name="description" label="Description" autoFocus />
        <DialogActions>
          <Button onClick={onClose}>Cancel</Button>
          <SubmitButton>Save</SubmitButton>
        </DialogActions>
      </Form>
    </Dialog>
  );
}

export function RetireDialog({ code, onClose }: { code: DefectCode; onClose: () => void }) {
  const update = useUpdateDefectCode();
  const retiring = code.active;
  return (
    <ConfirmDialog
      open
      title={retiring ? `Retire ${code.code}?` : `Bring back ${code.code}?`}
      confirmLabel={retiring ? 'Retire' : 'Bring back'}
      variant={retiring ? 'danger' : 'primary'}
      busy={update.isPending}
      error={update.error}
      onClose={onClose}
      onConfirm={() => update.mutate({ code: code.code, active: !retiring }, { onSuccess: onClose })}
    >
      {retiring ? (
        <p>
          “{code.description}” will no longer be offered when someone raises a concern. NCRs that already name{' '}
          <span className="font-mono">{code.code}</span> keep it, and the NCR list can still be filtered by it. You can
          bring it back later.
        </p>
      ) : (
        <p>“{code.description}” will be offered again when someone raises a concern.</p>
      )}
    </ConfirmDialog>
  );
}
