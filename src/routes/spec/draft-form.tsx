import { useId } from 'react';
import { useFieldArray, useFormContext, useWatch, type FieldValues } from 'react-hook-form';
import { z } from 'zod';
import {
  LIMIT_TYPE_LABELS,
  LIMIT_TYPES,
  ruleLimits,
  type RuleHistoryJson,
  type RuleJson,
  type RuleLimits,
} from '../../../shared/schemas/spec';
import { useCreateDraft } from '../../api/spec/create-draft';
import { useUpdateDraft } from '../../api/spec/update-draft';
import { Form, SubmitButton } from '../../components/form';
import { SelectField, TextAreaField } from '../../components/form-fields';
import { Button } from '../../components/ui/button';
import { describedBy, Field } from '../../components/ui/field';
import { Input } from '../../components/ui/input';
import { limitsFrom, limitsText, previewLimits, ruleLimitsText } from './limits';

type LimitType = RuleLimits['limitType'];

/** The number fields each kind of limit uses; the others are sent empty, as the server stores them. */
const USES: Record<LimitType, (keyof RuleLimits)[]> = {
  nominal: ['nominal', 'minusTol', 'plusTol'],
  range: ['lowerLimit', 'upperLimit'],
  min: ['lowerLimit'],
  max: ['upperLimit'],
};
const NUMBER_FIELDS = ['nominal', 'minusTol', 'plusTol', 'lowerLimit', 'upperLimit'] as const;

function onlyUsed(v: Record<string, unknown>): Record<string, unknown> {
  const uses = USES[v.limitType as LimitType] as string[] | undefined;
  if (!uses) return v;
  const out = { ...v };
  for (const f of NUMBER_FIELDS) if (!uses.includes(f)) out[f] = null;
  return out;
}

/**
 * The shared rule schema, after setting aside what the chosen kind of limit does not use: a
 * nominal typed before switching to "At least" neither blocks saving nor travels with the draft.
 */
export const draftSchema = z.looseObject({}).transform(onlyUsed).pipe(ruleLimits);

const typeOptions = LIMIT_TYPES.map((t) => ({ value: t, label: LIMIT_TYPE_LABELS[t] }));

const toNumber = (v: unknown) => {
  if (v === '' || v === null || v === undefined) return null;
  return typeof v === 'number' ? v : Number(String(v).trim().replace(',', '.'));
};

/** A number with its unit beside it; empty is "not set" (null), which the schema asks for by name. */
function LimitField({
  name,
  label,
  hint,
  unit,
}: {
  name: keyof RuleLimits;
  label: string;
  hint: string;
  unit?: string | null;
}) {
  const id = useId();
  const { register, formState } = useFormContext<FieldValues>();
  const error = formState.errors[name]?.message as string | undefined;
  const fullHint = unit ? `${hint} Unit: ${unit}.` : hint;
  return (
    <Field id={id} label={label} hint={fullHint} error={error}>
      <span className="flex items-center gap-2">
        <Input
          id={id}
          type="text"
          inputMode="decimal"
          autoComplete="off"
          mono
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy(id, fullHint, error)}
          {...register(name, { setValueAs: toNumber })}
        />
        {unit && (
          <span aria-hidden="true" className="w-10 shrink-0 font-mono text-sm text-ink-soft">
            {unit}
          </span>
        )}
      </span>
    </Field>
  );
}

type SizeClassKey = 'code' | 'name' | 'nominal' | 'minusTol' | 'plusTol';

/** One field of one size class, its label naming the class's place in the list. */
function SizeClassField({
  index,
  field,
  label,
  unit,
  number,
}: {
  index: number;
  field: SizeClassKey;
  label: string;
  unit?: string | null;
  number?: boolean;
}) {
  const id = useId();
  const { register, formState } = useFormContext<FieldValues>();
  const rows = formState.errors.sizeClasses as unknown as
    Record<number, Record<string, { message?: string }>> | undefined;
  const error = rows?.[index]?.[field]?.message;
  return (
    <Field id={id} label={`Size class ${index + 1} ${label}`} error={error}>
      <span className="flex items-center gap-2">
        <Input
          id={id}
          type="text"
          inputMode={number ? 'decimal' : undefined}
          autoComplete="off"
          mono
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy(id, undefined, error)}
          {...register(`sizeClasses.${index}.${field}`, number ? { setValueAs: toNumber } : {})}
        />
        {unit && (
          <span aria-hidden="true" className="w-10 shrink-0 font-mono text-sm text-ink-soft">
            {unit}
          </span>
        )}
      </span>
    </Field>
  );
}

/**
 * Size classes: bored or ground to the smallest step that cleans up, each step with its own
 * nominal and tolerances in the rule's unit. None means the part is judged on the limits above
 * alone, and the station asks for no class.
 */
function SizeClassFields({ unit }: { unit: string | null }) {
  const { control } = useFormContext<FieldValues>();
  const rows = useFieldArray({ control, name: 'sizeClasses' });
  return (
    <fieldset className="flex flex-col gap-3 rounded-control border border-rule px-4 py-3">
      <legend className="px-1 font-semibold">Size classes</legend>
      <p className="text-sm text-ink-soft">
        {rows.fields.length
          ? 'The station records which class a part was machined to and judges it on that class. Codes as written on parts and boxes, e.g. STD or +0.25.'
          : 'None: every part is judged on the limits above. Add classes for oversize bores or undersize journals.'}
      </p>
      {rows.fields.map((row, i) => (
        <div
          key={row.id}
          role="group"
          aria-label={`Size class ${i + 1}`}
          className="grid grid-cols-1 items-start gap-3 border-t border-rule pt-3 sm:grid-cols-3"
        >
          <SizeClassField index={i} field="code" label="code" />
          <SizeClassField index={i} field="name" label="name" />
          <SizeClassField index={i} field="nominal" label="nominal" unit={unit} number />
          <SizeClassField index={i} field="minusTol" label="minus tolerance" unit={unit} number />
          <SizeClassField index={i} field="plusTol" label="plus tolerance" unit={unit} number />
          <div className="sm:pt-6">
            <Button
              variant="danger"
              icon="trash"
              aria-label={`Remove size class ${i + 1}`}
              onClick={() => rows.remove(i)}
            >
              Remove
            </Button>
          </div>
        </div>
      ))}
      <div>
        <Button
          icon="plus"
          disabled={rows.fields.length >= 12}
          // keeps the focus in the field just typed in until the click lands: its blur re-validates
          // the form, and the new row must not be lost to that re-render
          onMouseDown={(e) => e.preventDefault()}
          onClick={() => rows.append({ code: '', name: '', nominal: null, minusTol: 0, plusTol: null })}
        >
          Add a size class
        </Button>
      </div>
    </fieldset>
  );
}

function LimitFields({ unit }: { unit: string | null }) {
  const type = useWatch<FieldValues>({ name: 'limitType' }) as LimitType;
  return (
    <div className="flex flex-col gap-4">
      <div className="max-w-sm">
        <SelectField name="limitType" label="Limit type" options={typeOptions} />
      </div>
      <div className="grid grid-cols-1 gap-4 sm:grid-cols-3">
        {type === 'nominal' && (
          <>
            <LimitField name="nominal" label="Nominal" hint="The target value." unit={unit} />
            <LimitField
              name="minusTol"
              label="Minus tolerance"
              hint="How far below still passes; 0 if none."
              unit={unit}
            />
            <LimitField
              name="plusTol"
              label="Plus tolerance"
              hint="How far above still passes; 0 if none."
              unit={unit}
            />
          </>
        )}
        {(type === 'range' || type === 'min') && (
          <LimitField name="lowerLimit" label="Lower limit" hint="The lowest value that passes." unit={unit} />
        )}
        {(type === 'range' || type === 'max') && (
          <LimitField name="upperLimit" label="Upper limit" hint="The highest value that passes." unit={unit} />
        )}
      </div>
      <div className="grid grid-cols-1 gap-4 sm:grid-cols-3">
        <LimitField
          name="resolution"
          label="Resolution"
          hint="Readings are rounded to this step before they are judged."
          unit={unit}
        />
      </div>
      <SizeClassFields unit={unit} />
      <TextAreaField
        name="sourceNote"
        label="Source note"
        hint="Where the numbers come from: drawing, manual, engineering change. At most 300 characters."
      />
    </div>
  );
}

/** What the fields would make the rule, beside what is in force now, as the engineer types. */
function Preview({ history }: { history: RuleHistoryJson }) {
  const values = useWatch<FieldValues>();
  const c = history.characteristic;
  const unit = c.unit;
  const parsed = draftSchema.safeParse(values);
  const limits = parsed.success ? previewLimits(parsed.data) : null;
  const text = limits ? limitsText(limits, unit) : null;
  const now = c.inForce ? ruleLimitsText(c.inForce, c) : null;
  return (
    <div className="grid grid-cols-1 gap-3 rounded-control border border-rule bg-sunk px-4 py-3 sm:grid-cols-2">
      <div>
        <p className="text-xs font-semibold uppercase tracking-wide text-ink-soft">This draft passes</p>
        <p className="font-mono text-xl font-semibold" aria-live="polite">
          {text ?? <span className="font-sans text-base font-normal text-ink-soft">Complete the fields to see.</span>}
        </p>
        {text && now && (
          <p className="text-sm text-ink-soft">
            {text === now ? 'Same limits as in force.' : 'Changed from the version in force.'}
          </p>
        )}
      </div>
      <div>
        <p className="text-xs font-semibold uppercase tracking-wide text-ink-soft">In force now</p>
        <p className="font-mono text-xl">
          {now ?? <span className="font-sans text-base text-ink-soft">No version</span>}
        </p>
      </div>
    </div>
  );
}

type ActionsProps = {
  saved: boolean;
  canApprove: boolean;
  discarding: boolean;
  onDiscard: () => void;
  onApprove: () => void;
};

function Actions({ saved, canApprove, discarding, onDiscard, onApprove }: ActionsProps) {
  const { formState } = useFormContext();
  const unsaved = formState.isDirty || !saved;
  return (
    <div className="flex flex-wrap items-center justify-between gap-3 border-t border-rule pt-4">
      <Button variant="danger" icon="trash" onClick={onDiscard} disabled={discarding} aria-busy={discarding}>
        Discard draft
      </Button>
      <div className="flex flex-wrap items-center justify-end gap-2">
        {canApprove && unsaved && saved && (
          <p className="text-sm text-ink-soft">Save the draft first: the approval signs what is saved.</p>
        )}
        <SubmitButton variant={canApprove && !unsaved ? 'secondary' : 'primary'}>Save draft</SubmitButton>
        {canApprove && saved && (
          <Button variant="primary" icon="key" onClick={onApprove} disabled={unsaved}>
            Approve…
          </Button>
        )}
      </div>
    </div>
  );
}

type DraftFormProps = {
  history: RuleHistoryJson;
  /** null while the draft is only on this screen (nothing in force to copy from). */
  draft: RuleJson | null;
  canApprove: boolean;
  discarding: boolean;
  onSaved: (rule: RuleJson) => void;
  onDiscard: () => void;
  onApprove: () => void;
};

export function DraftForm({ history, draft, canApprove, discarding, onSaved, onDiscard, onApprove }: DraftFormProps) {
  const create = useCreateDraft();
  const update = useUpdateDraft();
  const c = history.characteristic;
  const save = async (limits: RuleLimits) => {
    const rule = draft
      ? await update.mutateAsync({ id: draft.id, limits })
      : await create.mutateAsync({ family: history.family.code, characteristicId: c.id, limits });
    onSaved(rule);
  };
  const start = limitsFrom(draft, c);
  // an unknown resolution starts empty, to be asked for, rather than as an impossible 0
  const defaults = { ...start, resolution: start.resolution > 0 ? start.resolution : null };
  return (
    <Form schema={draftSchema} defaultValues={defaults} onSubmit={save}>
      <LimitFields unit={c.unit} />
      <Preview history={history} />
      <Actions
        saved={draft !== null}
        canApprove={canApprove}
        discarding={discarding}
        onDiscard={onDiscard}
        onApprove={onApprove}
      />
    </Form>
  );
}
