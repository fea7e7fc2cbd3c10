import {
  createStationBody,
  PART_KIND_LABELS,
  updateStationBody,
  type Stage,
  type Station,
} from '../../../../shared/schemas/reference';
import { useCreateStation } from '../../../api/reference/create-station';
import { useStages } from '../../../api/reference/stages';
import { useUpdateStation } from '../../../api/reference/update-station';
import { ConfirmDialog } from '../../../components/confirm-dialog';
import { Form, SubmitButton } from '../../../components/form';
import { SelectField, TextField } from '../../../components/form-fields';
import { Button } from '../../../components/ui/button';
import { Dialog, DialogActions } from '../../../components/ui/dialog';
import type { OptionGroup } from '../../../components/ui/select';

/** Stages grouped by the part they work on, in route order. */
function stageGroups(stages: Stage[]): OptionGroup[] {
  const groups = new Map<string, OptionGroup>();
  for (const s of stages) {
    const label = PART_KIND_LABELS[s.partKind] ?? s.partKind;
    if (!groups.has(label)) groups.set(label, { label, options: [] });
    groups.get(label)!.options.push({ value: s.code, label: s.name });
  }
  return [...groups.values()];
}

function StageField() {
  const stages = useStages();
  return (
    <SelectField
      name="stageCode"
      label="Stage it records"
      placeholder="No stage (not recording yet)"
      emptyIsNull
      groups={stageGroups(stages.data ?? [])}
    />
  );
}

export function AddStationDialog({ onClose }: { onClose: () => void }) {
  const create = useCreateStation();
  return (
    <Dialog open onClose={onClose} title="Add a station">
      <Form
        schema={createStationBody}
        defaultValues={{ code: '', name: '', stageCode: null, location: '' }}
        onSubmit={async (values) => {
          await create.mutateAsync(values);
          onClose();
        }}
      >
        <TextField
          name="code"
          label="Code"
          mono
          autoFocus
          hint="2–20 letters, digits or dashes, as painted on the station, e.g. BH-2. Cannot be changed later."
        />
        <TextField name="name" label="Name" />
        <StageField />
        <TextField name="location" label="Location" hint="Bay, shop or cell, as people on the floor say it." />
        <DialogActions>
          <Button onClick={onClose}>Cancel</Button>
          <SubmitButton>Add station</SubmitButton>
        </DialogActions>
      </Form>
    </Dialog>
  );
}

export function EditStationDialog({ station, onClose }: { station: Station; onClose: () => void }) {
  const update = useUpdateStation();
  return (
    <Dialog open onClose={onClose} title={`Edit station ${station.code}`}>
      <Form
        schema={updateStationBody}
        defaultValues={{ name: station.name, stageCode: station.stageCode, location: station.location }}
        onSubmit={async (values) => {
          await update.mutateAsync({ id: station.id, ...values });
          onClose();
        }}
      >
        <TextField name="name" label="Name" autoFocus />
        <StageField />
        <TextField name="location" label="Location" />
        <DialogActions>
          <Button onClick={onClose}>Cancel</Button>
          <SubmitButton>Save</SubmitButton>
        </DialogActions>
      </Form>
    </Dialog>
  );
}

export function ServiceDialog({ station, onClose }: { station: Station; onClose: () => void }) {
  const update = useUpdateStation();
  const taking = station.active;
  return (
    <ConfirmDialog
      open
      title={taking ? `Take ${station.code} out of service?` : `Return ${station.code} to service?`}
      confirmLabel={taking ? 'Take out of service' : 'Return to service'}
      variant={taking ? 'danger' : 'primary'}
      busy={update.isPending}
      error={update.error}
      onClose={onClose}
      onConfirm={() => update.mutate({ id: station.id, active: !taking }, { onSuccess: onClose })}
    >
      {taking ? (
        <p>
          {station.name} will take no new results. Everything already recorded there stays on record. You can return it
          to service later.
        </p>
      ) : (
        <p>{station.name} can take results again.</p>
      )}
    </ConfirmDialog>
  );
}
