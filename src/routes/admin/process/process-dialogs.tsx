import { z } from 'zod';
import {
  CHARACTERISTIC_KINDS,
  POSITION_SCHEMES,
  castingNumberBody,
  processCode,
  type CharacteristicBody,
  partKindBody,
  stageBody,
  type PartKindJson,
  type ProcessStageJson,
} from '../../../../shared/schemas/process';
import { UNIT_SYMBOLS } from '../../../../shared/domain/units';
import { LOT_KIND_LABELS, SIZED_LOT_KINDS, type LotKind } from '../../../../shared/schemas/build';
import {
  useAddCastingNumber,
  useCreateCharacteristic,
  useCreatePartKind,
  useCreateStage,
} from '../../../api/process/mutations';
import { CheckboxField } from '../../../components/choice-fields';
import { Form, SubmitButton } from '../../../components/form';
import { NumberField, SelectField, TextAreaField, TextField } from '../../../components/form-fields';
import { Button } from '../../../components/ui/button';
import { Dialog, DialogActions } from '../../../components/ui/dialog';

const kindOptions = (kinds: PartKindJson[]) =>
  kinds.filter((k) => !k.retired).map((k) => ({ value: k.code, label: k.name }));

export function AddPartKindDialog({ onClose }: { onClose: () => void }) {
  const create = useCreatePartKind();
  return (
    <Dialog open onClose={onClose} title="Add a part kind">
      <Form
        schema={partKindBody}
        defaultValues={{ code: '', name: '', serialized: true }}
        onSubmit={async (v) => {
          await create.mutateAsync(v);
          onClose();
        }}
      >
        <TextField
          name="code"
          label="Code"
          mono
          autoFocus
          hint="Lower-case words joined by underscores, e.g. oil_pump."
        />
        <TextField name="name" label="Name" />
        <CheckboxField name="serialized" label="Each part gets its own serial" />
        <DialogActions>
          <Button onClick={onClose}>Cancel</Button>
          <SubmitButton>Add part kind</SubmitButton>
        </DialogActions>
      </Form>
    </Dialog>
  );
}

export function AddStageDialog({ kinds, onClose }: { kinds: PartKindJson[]; onClose: () => void }) {
  const create = useCreateStage();
  return (
    <Dialog open onClose={onClose} title="Add a stage">
      <Form
        schema={stageBody}
        defaultValues={{ code: '', name: '', caution: null, hazardous: false, runTest: false, description: '' }}
        onSubmit={async (v) => {
          await create.mutateAsync(v);
          onClose();
        }}
      >
        <TextField name="code" label="Code" mono autoFocus hint="Lower-case words joined by dashes, e.g. pump-test." />
        <TextField name="name" label="Name" />
        <SelectField
          name="partKind"
          label="Part it works on"
          placeholder="Choose a part kind"
          options={kindOptions(kinds)}
        />
        <CheckboxField name="hazardous" label="This work can hurt someone" />
        <CheckboxField
          name="runTest"
          label="This is the unit's run test (long block only): release requires it passed"
        />
        <TextAreaField
          name="caution"
          label="Caution shown at the station"
          optional
          hint="A short caution that defers to the plant's procedures, local codes and licensed practice."
        />
        <TextField name="description" label="Description" optional />
        <DialogActions>
          <Button onClick={onClose}>Cancel</Button>
          <SubmitButton>Add stage</SubmitButton>
        </DialogActions>
      </Form>
    </Dialog>
  );
}

/** The form's shape: positions chosen as one word, gauge kinds typed as one comma-separated line. */
const characteristicFormBase = z.object({
  stage: processCode,
  code: processCode,
  name: z.string().trim().min(2, 'Enter a name of at least 2 characters.').max(120),
  kind: z.enum(CHARACTERISTIC_KINDS),
  per: z.enum(POSITION_SCHEMES),
  unit: z.string().nullable().default(null),
  resolution: z.number().nullable().default(null),
  critical: z.boolean().default(false),
  defectCode: z.string().optional(),
  gauges: z.string().optional(),
  matesWith: z
    .enum(SIZED_LOT_KINDS as [LotKind, ...LotKind[]])
    .nullable()
    .default(null),
});
// the server checks the whole body again (units, resolution, defect code) and its notes land on these fields
const characteristicForm = characteristicFormBase.transform((v) => ({
  stage: v.stage,
  code: v.code,
  name: v.name,
  kind: v.kind,
  unit: v.kind === 'variable' ? v.unit : null,
  resolution: v.kind === 'variable' ? v.resolution : null,
  positions: v.per === 'deck' ? { per: v.per, points: 4 } : { per: v.per },
  critical: v.critical,
  defectCode: v.defectCode || null,
  gaugeKinds: (v.gauges ?? '')
    .split(',')
    .map((s) => s.trim())
    .filter(Boolean),
  matesWith: v.kind === 'variable' ? v.matesWith : null,
})) as unknown as z.ZodType<CharacteristicBody, z.input<typeof characteristicFormBase>>;

export function AddCharacteristicDialog({ stages, onClose }: { stages: ProcessStageJson[]; onClose: () => void }) {
  const create = useCreateCharacteristic();
  return (
    <Dialog open onClose={onClose} title="Add a characteristic">
      <Form
        schema={characteristicForm}
        defaultValues={{ kind: 'variable', per: 'part', critical: false, gauges: '' }}
        onSubmit={async (body) => {
          await create.mutateAsync(body);
          onClose();
        }}
      >
        <SelectField
          name="stage"
          label="Stage"
          placeholder="Choose a stage"
          options={stages.filter((s) => !s.retired).map((s) => ({ value: s.code, label: `${s.name} (${s.code})` }))}
        />
        <TextField name="code" label="Code" mono hint="Lower-case words joined by dashes, e.g. deck-flatness." />
        <TextField name="name" label="Name" />
        <SelectField
          name="kind"
          label="Kind"
          options={[
            { value: 'variable', label: 'Measured' },
            { value: 'attribute', label: 'Pass / fail' },
          ]}
        />
        <SelectField
          name="per"
          label="Taken at"
          options={[
            { value: 'part', label: 'Once per part' },
            { value: 'cylinder', label: 'Each cylinder' },
            { value: 'main', label: 'Each main bearing bore or journal' },
            { value: 'crankpin', label: 'Each crankpin' },
            { value: 'valve', label: 'Each valve' },
            { value: 'deck', label: 'Points on the deck' },
          ]}
        />
        <SelectField
          name="unit"
          label="Unit (measured only)"
          placeholder="No unit"
          emptyIsNull
          options={UNIT_SYMBOLS.map((u) => ({ value: u, label: u }))}
        />
        <NumberField name="resolution" label="Resolution (measured only)" nullable />
        <CheckboxField name="critical" label="Critical characteristic" />
        <TextField name="defectCode" label="Defect code for its NCR" mono optional />
        <TextField name="gauges" label="Gauge kinds that can measure it" optional hint="Separate them with commas." />
        <SelectField
          name="matesWith"
          label="Size class matches (measured only)"
          placeholder="No purchased part"
          emptyIsNull
          options={SIZED_LOT_KINDS.map((k) => ({ value: k, label: LOT_KIND_LABELS[k] }))}
        />
        <DialogActions>
          <Button onClick={onClose}>Cancel</Button>
          <SubmitButton>Add characteristic</SubmitButton>
        </DialogActions>
      </Form>
    </Dialog>
  );
}

export function AddCastingNumberDialog({
  family,
  kinds,
  onClose,
}: {
  family: string;
  kinds: PartKindJson[];
  onClose: () => void;
}) {
  const add = useAddCastingNumber();
  return (
    <Dialog open onClose={onClose} title={`Add a casting number to ${family}`}>
      <Form
        schema={castingNumberBody}
        defaultValues={{ castingNumber: '', partKind: 'block', note: '' }}
        onSubmit={async (v) => {
          await add.mutateAsync({ family, ...v });
          onClose();
        }}
      >
        <TextField name="castingNumber" label="Casting number" mono autoFocus />
        <SelectField name="partKind" label="Part it is cast on" options={kindOptions(kinds)} />
        <TextField name="note" label="Note" optional />
        <DialogActions>
          <Button onClick={onClose}>Cancel</Button>
          <SubmitButton>Add casting number</SubmitButton>
        </DialogActions>
      </Form>
    </Dialog>
  );
}
