import { useEffect } from 'react';
import { useFieldArray, useFormContext, useWatch } from 'react-hook-form';
import { z } from 'zod';
import { measurementBody, signaturePassword, type ClaimJson } from '../../../shared/schemas/warranty';
import { useSignedIn } from '../../api/auth/me';
import { useClaimStep } from '../../api/warranty/claim-step';
import { useCauseCodes } from '../../api/warranty/cause-codes';
import { Caution } from '../../components/caution';
import { Form } from '../../components/form';
import { NumberField, SelectField, TextAreaField } from '../../components/form-fields';
import { PhotoField } from '../../components/photo-field';
import { SignStep } from '../../components/sign-dialog';
import { Button } from '../../components/ui/button';

/** The form's own shape: a finding names its part or lot in one choice ("part:SERIAL" or "lot:CODE"). */
const teardownForm = z.object({
  findings: z
    .array(
      z.object({
        subject: z.string().min(1, 'Choose the part or lot it concerns.'),
        causeCode: z.string().min(1, 'Choose a cause code.'),
        description: z
          .string()
          .trim()
          .min(5, 'Say what was found, in at least 5 characters.')
          .max(2000, 'At most 2000 characters.'),
        measurements: z.array(measurementBody).max(30),
        photoIds: z.array(z.number()).max(8),
      }),
    )
    .min(1, 'Record at least one finding.')
    .max(20),
  notes: z.string().trim().max(2000),
  password: signaturePassword,
});
type TeardownForm = z.output<typeof teardownForm>;

const blank = { subject: '', causeCode: '', description: '', measurements: [], photoIds: [] };

function Measurements({ claim, index }: { claim: ClaimJson; index: number }) {
  const { control, trigger, getFieldState } = useFormContext<TeardownForm>();
  const subject = useWatch({ control, name: `findings.${index}.subject` });
  const rows = useFieldArray({ control, name: `findings.${index}.measurements` });
  const chosen = useWatch({ control, name: `findings.${index}.measurements` });
  // leaving a row's other fields checks the whole row, the still-empty value too; once a value is
  // typed, that note goes at once rather than when the value field is left
  useEffect(() => {
    (chosen ?? []).forEach((m, j) => {
      const name = `findings.${index}.measurements.${j}.value` as const;
      if (Number.isFinite(m?.value) && getFieldState(name).error) void trigger(name);
    });
  }, [chosen, index, trigger, getFieldState]);
  const part = subject?.startsWith('part:') ? claim.parts.find((p) => p.serial === subject.slice(5)) : undefined;
  if (!part || part.characteristics.length === 0) return null;
  return (
    <fieldset className="flex flex-col gap-2">
      <legend className="text-sm font-medium">Measured again at teardown (optional)</legend>
      {rows.fields.map((row, j) => {
        const c = part.characteristics.find((x) => x.code === chosen?.[j]?.characteristic);
        return (
          <div key={row.id} className="grid grid-cols-1 items-end gap-2 sm:grid-cols-[2fr_2fr_1fr_auto]">
            <SelectField
              name={`findings.${index}.measurements.${j}.characteristic`}
              label="Characteristic"
              placeholder="Choose…"
              options={part.characteristics.map((x) => ({ value: x.code, label: x.name }))}
            />
            <SelectField
              name={`findings.${index}.measurements.${j}.position`}
              label="Position"
              placeholder="Choose…"
              options={(c?.positions ?? []).map((p) => ({ value: p.code, label: p.label }))}
            />
            <NumberField name={`findings.${index}.measurements.${j}.value`} label="Value" unit={c?.unit ?? undefined} />
            <Button
              size="md"
              onClick={() => rows.remove(j)}
              aria-label={`Remove measurement ${j + 1} of finding ${index + 1}`}
            >
              Remove
            </Button>
          </div>
        );
      })}
      <div>
        <Button
          size="sm"
          icon="plus"
          onClick={() => rows.append({ characteristic: '', position: '', value: Number.NaN })}
        >
          Add a measurement
        </Button>
      </div>
    </fieldset>
  );
}

function Findings({ claim }: { claim: ClaimJson }) {
  const { control } = useFormContext<TeardownForm>();
  const list = useFieldArray({ control, name: 'findings' });
  const causes = useCauseCodes();
  const subjects = [
    {
      label: 'Parts in the unit when it shipped',
      options: claim.parts.map((p) => ({
        value: `part:${p.serial}`,
        label: `${p.kindLabel}${p.positionLabel ? ` (${p.positionLabel})` : ''} · ${p.serial}`,
      })),
    },
    {
      label: 'Purchased lots in it',
      options: claim.lots.map((l) => ({
        value: `lot:${l.lotCode}`,
        label: `${l.kind.replace(/_/g, ' ')} · lot ${l.lotCode}`,
      })),
    },
  ];
  const causeOptions = (causes.data ?? [])
    .filter((c) => c.active)
    .map((c) => ({ value: c.code, label: `${c.code} — ${c.description}` }));
  return (
    <div className="flex flex-col gap-4">
      {list.fields.map((field, i) => (
        <fieldset key={field.id} className="flex flex-col gap-3 rounded-card border border-rule bg-sunk/50 p-4">
          <legend className="px-1 font-semibold">Finding {i + 1}</legend>
          <div className="grid grid-cols-1 gap-3 md:grid-cols-2">
            <SelectField
              name={`findings.${i}.subject`}
              label="Concerns"
              placeholder="Choose the part or lot…"
              groups={subjects}
            />
            <SelectField name={`findings.${i}.causeCode`} label="Cause" placeholder="Choose…" options={causeOptions} />
          </div>
          <TextAreaField name={`findings.${i}.description`} label="What was found" />
          <Measurements claim={claim} index={i} />
          <PhotoField name={`findings.${i}.photoIds`} label="Photos" max={8} />
          {list.fields.length > 1 && (
            <div>
              <Button variant="danger" size="sm" icon="trash" onClick={() => list.remove(i)}>
                Remove finding {i + 1}
              </Button>
            </div>
          )}
        </fieldset>
      ))}
      <div>
        <Button icon="plus" onClick={() => list.append({ ...blank })}>
          Add a finding
        </Button>
      </div>
    </div>
  );
}

/**
 * The returned unit's teardown, recorded on the floor: each finding against the part (or lot) it
 * concerns, with a cause code of the plant's own and anything measured again, signed at the end.
 */
export function TeardownForm({ claim }: { claim: ClaimJson }) {
  const me = useSignedIn();
  const step = useClaimStep(claim.number, 'teardown');
  return (
    <div className="flex flex-col gap-4">
      <Caution title="Tearing down a returned engine">
        A unit back from the field may still hold oil, coolant and fuel, and it is heavy. Drain it, lift it with rated
        gear and strip it as the plant’s teardown procedure says; this screen does not replace it.
      </Caution>
      <Form
        schema={teardownForm}
        defaultValues={{ findings: [{ ...blank }], notes: '', password: '' }}
        onSubmit={async (v) => {
          await step.mutateAsync({
            notes: v.notes,
            password: v.password,
            findings: v.findings.map((f) => ({
              ...(f.subject.startsWith('lot:') ? { lotCode: f.subject.slice(4) } : { part: f.subject.slice(5) }),
              causeCode: f.causeCode,
              description: f.description,
              measurements: f.measurements,
              photoIds: f.photoIds,
            })),
          });
        }}
      >
        <Findings claim={claim} />
        <TextAreaField
          name="notes"
          label="Notes on the teardown"
          hint="Anything the findings do not say: how it arrived, what was missing."
        />
        <SignStep
          label="Sign the teardown"
          signer={me?.user.name ?? 'you'}
          meaning="record this teardown and its findings"
          subject={claim.unit.serial}
        >
          The warranty desk is told, and each finding is kept beside what was measured on its part when it was built.
        </SignStep>
      </Form>
    </div>
  );
}
