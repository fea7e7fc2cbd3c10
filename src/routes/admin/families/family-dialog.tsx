import { useEffect } from 'react';
import { useFormContext, useWatch } from 'react-hook-form';
import { displacementLitres } from '../../../../shared/domain/geometry';
import { familyBody, type EngineFamily, type FamilyBody } from '../../../../shared/schemas/reference';
import { useCreateFamily } from '../../../api/reference/create-family';
import { useUpdateFamily } from '../../../api/reference/update-family';
import { Form, SubmitButton } from '../../../components/form';
import { NumberField, SelectField, TextAreaField, TextField } from '../../../components/form-fields';
import { Button } from '../../../components/ui/button';
import { Dialog, DialogActions } from '../../../components/ui/dialog';

const layoutOptions = [
  { value: 'inline', label: 'Inline (one head)' },
  { value: 'v', label: 'V (two heads)' },
];

/** Heads follow the layout (the schema insists), so changing one sets the other. */
function HeadsFollowLayout() {
  const { setValue, getValues } = useFormContext<FamilyBody>();
  const layout = useWatch<FamilyBody, 'layout'>({ name: 'layout' });
  useEffect(() => {
    const heads = layout === 'v' ? 2 : 1;
    if (getValues('headsPerEngine') !== heads) setValue('headsPerEngine', heads, { shouldValidate: true });
  }, [layout, getValues, setValue]);
  return null;
}

/** Shows the swept volume as it will be stored, so a typing slip in bore or stroke is seen at once. */
function DisplacementPreview() {
  const [bore, stroke, cylinders] = useWatch<FamilyBody, ['boreMm', 'strokeMm', 'cylinders']>({
    name: ['boreMm', 'strokeMm', 'cylinders'],
  });
  const ok = [bore, stroke, cylinders].every((v) => typeof v === 'number' && Number.isFinite(v) && v > 0);
  return (
    <p className="rounded-control border border-rule bg-sunk px-3 py-2 text-sm text-ink-soft" aria-live="polite">
      Displacement:{' '}
      <span className="font-mono text-ink">
        {ok ? `${displacementLitres(bore, stroke, cylinders).toFixed(2)} L` : '—'}
      </span>{' '}
      (π/4 × bore² × stroke × cylinders)
    </p>
  );
}

const blank = {
  code: '',
  name: '',
  description: '',
  layout: 'inline' as const,
  headsPerEngine: 1,
  warrantyMonths: 24,
  warrantyKm: null,
};

export function FamilyDialog({ family, onClose }: { family: EngineFamily | null; onClose: () => void }) {
  const create = useCreateFamily();
  const update = useUpdateFamily();
  const defaults = family ? (({ id: _id, active: _active, displacementL: _d, ...body }) => body)(family) : blank;

  return (
    <Dialog open onClose={onClose} width="wide" title={family ? `Edit ${family.code}` : 'Add an engine family'}>
      <Form
        schema={familyBody}
        defaultValues={defaults}
        onSubmit={async (body) => {
          if (family) await update.mutateAsync({ id: family.id, body });
          else await create.mutateAsync(body);
          onClose();
        }}
      >
        <HeadsFollowLayout />
        <div className="grid grid-cols-1 gap-4 sm:grid-cols-[minmax(0,1fr)_minmax(0,2fr)]">
          <TextField name="code" label="Code" mono autoFocus hint="2–20 letters, digits or dashes." />
          <TextField name="name" label="Name" />
        </div>
        <TextAreaField
          name="description"
          label="Description"
          hint="Optional. What sets this family apart on the floor."
        />
        <div className="grid grid-cols-2 gap-4 sm:grid-cols-4">
          <SelectField name="layout" label="Layout" options={layoutOptions} />
          <NumberField name="cylinders" label="Cylinders" integer />
          <NumberField name="boreMm" label="Bore" unit="mm" />
          <NumberField name="strokeMm" label="Stroke" unit="mm" />
        </div>
        <DisplacementPreview />
        <div className="grid grid-cols-2 gap-4 sm:grid-cols-3">
          <NumberField name="headsPerEngine" label="Heads" integer hint="Set by the layout." />
          <NumberField name="warrantyMonths" label="Warranty" unit="months" integer />
          <NumberField
            name="warrantyKm"
            label="Warranty distance"
            unit="km"
            integer
            nullable
            hint="Leave empty for time only."
          />
        </div>
        <DialogActions>
          <Button onClick={onClose}>Cancel</Button>
          <SubmitButton>{family ? 'Save' : 'Add engine family'}</SubmitButton>
        </DialogActions>
      </Form>
    </Dialog>
  );
}
