import { useId } from 'react';
import { useFormContext } from 'react-hook-form';
import { reentryBody } from '../../../shared/schemas/results';
import { useAllowReentry } from '../../api/station/allow-reentry';
import type { StationFormJson } from '../../api/station/types';
import { Form, SubmitButton } from '../../components/form';
import { describedBy, Field } from '../../components/ui/field';
import { Button } from '../../components/ui/button';
import { Dialog, DialogActions } from '../../components/ui/dialog';
import { bigControl } from './controls';

const REASON_HINT = 'Why the part goes through this stage again, e.g. a reading taken with the wrong gauge.';

function ReasonField() {
  const id = useId();
  const { register, formState } = useFormContext<{ reason: string }>();
  const error = formState.errors.reason?.message;
  return (
    <Field id={id} label="Reason" hint={REASON_HINT} error={error}>
      <textarea
        id={id}
        autoFocus
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(id, REASON_HINT, error)}
        className={`${bigControl} min-h-28 py-2`}
        {...register('reason')}
      />
    </Field>
  );
}

/**
 * A supervisor's reason for sending a part through a stage again. Its own module: it validates
 * with the shared zod schema, which a station tablet loads only when someone opens this dialog.
 */
export function ReentryDialog({
  form,
  onClose,
  onDone,
}: {
  form: StationFormJson;
  onClose: () => void;
  onDone: () => void;
}) {
  const allow = useAllowReentry();
  return (
    <Dialog
      open
      onClose={onClose}
      title="Allow re-entry"
      description={`${form.item.serial} goes back to ${form.stage.name}. The next result there carries your reason.`}
    >
      <div data-density="floor">
        <Form
          schema={reentryBody}
          defaultValues={{ stage: form.stage.code, reason: '' }}
          onSubmit={async (body) => {
            await allow.mutateAsync({ serial: form.item.serial, body });
            onDone();
          }}
        >
          <ReasonField />
          <DialogActions>
            <Button size="lg" onClick={onClose}>
              Cancel
            </Button>
            <SubmitButton size="lg">Allow re-entry</SubmitButton>
          </DialogActions>
        </Form>
      </div>
    </Dialog>
  );
}
