import { useState } from 'react';
import { z } from 'zod';
import { LOT_KIND_LABELS, LOT_KINDS } from '../../../../shared/schemas/build';
import {
  DEFINITION_FIELDS,
  characteristicChangeBody,
  type CharacteristicChangeBody,
  type CharacteristicDefinition,
  type CharacteristicVersionJson,
} from '../../../../shared/schemas/characteristic-versions';
import type { CharacteristicJson } from '../../../../shared/schemas/process';
import type { SignedIn } from '../../../api/auth/me';
import {
  useApproveCharacteristicChange,
  useCharacteristicCompare,
  useCharacteristicVersions,
  useDiscardCharacteristicChange,
  useDraftCharacteristicChange,
} from '../../../api/process/characteristic-versions';
import { CheckboxField } from '../../../components/choice-fields';
import { Form, SubmitButton } from '../../../components/form';
import { SelectField, TextAreaField, TextField } from '../../../components/form-fields';
import { Badge, type Tone } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../../components/ui/card';
import { Dialog, DialogActions } from '../../../components/ui/dialog';
import { Field } from '../../../components/ui/field';
import { Notice } from '../../../components/ui/notice';
import { Select } from '../../../components/ui/select';
import { formatWhen } from '../../../lib/format';
import { SignChange } from './sign-change';

type DefField = (typeof DEFINITION_FIELDS)[number];

export const FIELD_LABELS: Record<DefField, string> = {
  name: 'Name',
  critical: 'Critical',
  optional: 'May be skipped at the station',
  help: 'Help shown at the station',
  gaugeKinds: 'Gauge kinds',
  defectCode: 'Defect code for its NCR',
  physicalMin: 'Lowest possible value',
  physicalMax: 'Highest possible value',
  matesWith: 'Size class matches',
};

/** A definition's value as the screens say it. */
export function valueText(field: DefField, v: unknown): string {
  if (v === null || v === undefined || v === '') return '—';
  if (typeof v === 'boolean') return v ? 'Yes' : 'No';
  if (Array.isArray(v)) return v.length ? v.join(', ') : 'Any suitable';
  if (field === 'matesWith') return LOT_KIND_LABELS[v as keyof typeof LOT_KIND_LABELS] ?? String(v);
  return String(v);
}

const STATUS: Record<CharacteristicVersionJson['status'], { label: string; tone: Tone }> = {
  draft: { label: 'Draft', tone: 'wait' },
  approved: { label: 'Approved', tone: 'ok' },
  superseded: { label: 'Superseded', tone: 'neutral' },
  discarded: { label: 'Discarded draft', tone: 'off' },
};

const blankOrNumber = z
  .string()
  .trim()
  .refine((v) => v === '' || Number.isFinite(Number(v.replace(',', '.'))), 'Enter a number, or leave it empty.');

/** The form holds text as typed; what is sent is only what differs from the definition in force. */
const changeForm = z.strictObject({
  name: z.string().trim().min(2, 'Enter a name of at least 2 characters.').max(120, 'At most 120 characters.'),
  critical: z.boolean(),
  optional: z.boolean(),
  help: z.string().trim().max(300, 'At most 300 characters.'),
  gaugeKinds: z.string().trim().max(400, 'At most 400 characters.'),
  defectCode: z.string().trim().max(20, 'At most 20 characters.'),
  physicalMin: blankOrNumber,
  physicalMax: blankOrNumber,
  matesWith: z.string(),
  note: characteristicChangeBody.shape.note,
});
type ChangeForm = z.output<typeof changeForm>;

const toNumber = (s: string) => (s === '' ? null : Number(s.replace(',', '.')));

function changesFrom(form: ChangeForm, current: CharacteristicDefinition): CharacteristicChangeBody {
  const next: CharacteristicDefinition = {
    name: form.name,
    critical: form.critical,
    optional: form.optional,
    help: form.help,
    gaugeKinds: form.gaugeKinds
      .split(',')
      .map((g) => g.trim())
      .filter(Boolean),
    defectCode: form.defectCode ? form.defectCode.toUpperCase() : null,
    physicalMin: toNumber(form.physicalMin),
    physicalMax: toNumber(form.physicalMax),
    matesWith: (form.matesWith || null) as CharacteristicDefinition['matesWith'],
  };
  const body: Record<string, unknown> = { note: form.note };
  for (const f of DEFINITION_FIELDS) {
    if (JSON.stringify(next[f]) !== JSON.stringify(current[f])) body[f] = next[f];
  }
  return body as CharacteristicChangeBody;
}

/** A draft of the next version: the fields a change may touch, filled with the definition in force. */
export function ProposeChangeDialog({ c, onClose }: { c: CharacteristicJson; onClose: () => void }) {
  const versions = useCharacteristicVersions(c.id);
  const draft = useDraftCharacteristicChange();
  const current = versions.data?.current;
  return (
    <Dialog
      open
      onClose={onClose}
      width="wide"
      title={`Propose a change to ${c.name}`}
      description="A draft of its next version. Nothing changes at the stations until someone other than you approves it with a signature. Kind, unit, resolution and positions cannot change: measured another way, it is a new characteristic."
    >
      {versions.error && (
        <Notice tone="bad" live="alert">
          {versions.error.message}
        </Notice>
      )}
      {!current && !versions.error && <p aria-busy="true">Reading the definition in force…</p>}
      {current && (
        <Form
          schema={changeForm}
          defaultValues={{
            name: current.name,
            critical: current.critical,
            optional: current.optional,
            help: current.help,
            gaugeKinds: current.gaugeKinds.join(', '),
            defectCode: current.defectCode ?? '',
            physicalMin: current.physicalMin === null ? '' : String(current.physicalMin),
            physicalMax: current.physicalMax === null ? '' : String(current.physicalMax),
            matesWith: current.matesWith ?? '',
            note: '',
          }}
          onSubmit={async (form) => {
            await draft.mutateAsync({ id: c.id, ...changesFrom(form, current) });
            onClose();
          }}
        >
          <TextField name="name" label="Name" />
          <div className="grid grid-cols-1 gap-3 md:grid-cols-2">
            <CheckboxField name="critical" label="Critical characteristic" />
            <CheckboxField name="optional" label="May be skipped at the station" />
          </div>
          <TextAreaField name="help" label="Help shown at the station" />
          <div className="grid grid-cols-1 gap-4 md:grid-cols-2">
            <TextField
              name="gaugeKinds"
              label="Gauge kinds"
              hint="Separated by commas; empty means any suitable gauge."
            />
            <TextField name="defectCode" label="Defect code for its NCR" mono hint="Empty for none." />
            {c.kind === 'variable' && (
              <>
                <TextField
                  name="physicalMin"
                  label={`Lowest possible value${c.unit ? ` (${c.unit})` : ''}`}
                  mono
                  inputMode="decimal"
                  hint="A reading outside these two is refused at the station as not possible."
                />
                <TextField
                  name="physicalMax"
                  label={`Highest possible value${c.unit ? ` (${c.unit})` : ''}`}
                  mono
                  inputMode="decimal"
                />
                <SelectField
                  name="matesWith"
                  label="Size class matches"
                  placeholder="No purchased part"
                  options={LOT_KINDS.map((k) => ({ value: k, label: LOT_KIND_LABELS[k] }))}
                />
              </>
            )}
          </div>
          <TextAreaField name="note" label="What changes and why" />
          <DialogActions>
            <Button onClick={onClose}>Cancel</Button>
            <SubmitButton>Save draft</SubmitButton>
          </DialogActions>
        </Form>
      )}
    </Dialog>
  );
}

/** Two versions field by field; a changed field is said in words and edged, not only coloured. */
export function CharacteristicCompare({ a, b }: { a: number; b: number }) {
  const cmp = useCharacteristicCompare(a, b);
  if (cmp.error)
    return (
      <Notice tone="bad" live="alert">
        {cmp.error.message}
      </Notice>
    );
  if (!cmp.data) return <p aria-busy="true">Comparing…</p>;
  const { left, right, rows } = cmp.data;
  const changed = rows.filter((r) => r.changed).map((r) => FIELD_LABELS[r.field as DefField] ?? r.field);
  const head = (v: CharacteristicVersionJson) => (
    <span className="flex flex-wrap items-center gap-2 normal-case tracking-normal">
      <span className="text-sm font-semibold text-ink">Version {v.version}</span>
      <Badge tone={STATUS[v.status].tone}>{STATUS[v.status].label}</Badge>
      {v.inForce && <Badge tone="accent">In force</Badge>}
    </span>
  );
  return (
    <section aria-label={`Version ${left.version} beside version ${right.version}`} className="flex flex-col gap-2">
      <p className="text-sm">
        {changed.length
          ? `${changed.length === 1 ? '1 field changes' : `${changed.length} fields change`}: ${changed.join(', ')}.`
          : 'The two versions define it the same way.'}
      </p>
      <div className="rounded-control border border-rule">
        <table className="w-full border-separate border-spacing-0 text-left text-[0.925rem]">
          <caption className="sr-only">
            Version {left.version} beside version {right.version}, field by field
          </caption>
          <thead>
            <tr className="bg-sunk">
              <th
                scope="col"
                className="border-b border-rule-strong px-3 py-2 text-xs font-semibold uppercase text-ink-soft"
              >
                Field
              </th>
              <th scope="col" className="border-b border-rule-strong px-3 py-2">
                {head(left)}
              </th>
              <th scope="col" className="border-b border-rule-strong px-3 py-2">
                {head(right)}
              </th>
              <th
                scope="col"
                className="border-b border-rule-strong px-3 py-2 text-xs font-semibold uppercase text-ink-soft"
              >
                Change
              </th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => {
              const f = r.field as DefField;
              const edge = r.changed ? 'border-l-4 border-l-accent bg-accent-tint' : 'border-l-4 border-l-transparent';
              return (
                <tr key={r.field}>
                  <th scope="row" className={`border-b border-rule px-3 py-1.5 font-medium ${edge}`}>
                    {FIELD_LABELS[f] ?? r.field}
                  </th>
                  <td className="border-b border-rule px-3 py-1.5">{valueText(f, r.left)}</td>
                  <td className={`border-b border-rule px-3 py-1.5 ${r.changed ? 'font-semibold' : ''}`}>
                    {valueText(f, r.right)}
                  </td>
                  <td className="border-b border-rule px-3 py-1.5">
                    {r.changed ? (
                      <span className="inline-flex items-center rounded-control border border-accent px-1.5 text-xs font-semibold uppercase tracking-wide text-accent-strong">
                        <span aria-hidden="true">≠&nbsp;</span>Changed
                      </span>
                    ) : (
                      <span className="text-sm text-ink-soft">Same</span>
                    )}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </section>
  );
}

/** One characteristic's versions: the draft waiting (compared, approved or discarded), the history, a comparison. */
export function CharacteristicHistory({
  c,
  me,
  onPropose,
  onClose,
}: {
  c: CharacteristicJson;
  me: SignedIn;
  onPropose: () => void;
  onClose: () => void;
}) {
  const versions = useCharacteristicVersions(c.id);
  const approve = useApproveCharacteristicChange();
  const discard = useDiscardCharacteristicChange();
  const [done, setDone] = useState<string | null>(null);
  const list = versions.data?.versions ?? [];
  const draft = list.find((v) => v.status === 'draft');
  const inForce = list.find((v) => v.inForce);
  const [pick, setPick] = useState<{ a: number; b: number } | null>(null);
  // by default the draft beside the version in force, or else the newest beside the one before it
  const b = pick?.b ?? (draft ?? list[0])?.id;
  const a = pick?.a ?? ((draft && inForce) || list[1])?.id;
  const canPropose = me.can('process.edit') && !c.retired && c.kind !== 'derived' && !draft;
  const options = list.map((v) => ({
    value: String(v.id),
    label: `Version ${v.version} — ${STATUS[v.status].label}${v.inForce ? ', in force' : ''}`,
  }));

  return (
    <Card labelledBy="char-history-heading">
      <CardHeader
        id="char-history-heading"
        title={`Changes to ${c.name}`}
        description={
          <>
            <span className="font-mono">
              {c.stage} / {c.code}
            </span>
            . Each change is a version: drafted by one person, approved with another’s signature.
          </>
        }
        actions={
          <>
            {canPropose && (
              <Button variant="primary" icon="plus" onClick={onPropose}>
                Propose a change
              </Button>
            )}
            <Button onClick={onClose}>Close</Button>
          </>
        }
      />
      <CardBody>
        <div className="flex flex-col gap-5">
          {versions.error && (
            <Notice tone="bad" live="alert">
              {versions.error.message}
            </Notice>
          )}
          {done && (
            <Notice tone="ok" live="status">
              {done}
            </Notice>
          )}
          {discard.error && (
            <Notice tone="bad" live="alert">
              {discard.error.message}
            </Notice>
          )}
          {c.kind === 'derived' && (
            <p className="text-ink-soft">
              Coretrail works this one out from other readings: its definition is in the code.
            </p>
          )}
          {versions.data && list.length === 0 && c.kind !== 'derived' && (
            <p className="text-ink-soft">
              No change yet. The first change keeps today’s definition as version 1, so the two can be compared.
            </p>
          )}
          {draft && (
            <section aria-labelledby="char-draft-heading" className="flex flex-col gap-3">
              <h3 id="char-draft-heading" className="flex flex-wrap items-center gap-2 font-semibold">
                Version {draft.version} is a draft <Badge tone="wait">Draft</Badge>
              </h3>
              <p className="text-sm text-ink-soft">
                Drafted by {draft.createdBy ?? '—'}: {draft.note}
              </p>
            </section>
          )}
          {list.length > 1 && a !== undefined && b !== undefined && (
            <section aria-labelledby="char-compare-heading" className="flex flex-col gap-3">
              <h3 id="char-compare-heading" className="font-semibold">
                Compare two versions
              </h3>
              <div className="flex flex-wrap gap-4">
                <Field id="compare-left" label="Left">
                  <Select
                    id="compare-left"
                    value={String(a)}
                    options={options}
                    onChange={(e) => setPick({ a: Number(e.target.value), b })}
                  />
                </Field>
                <Field id="compare-right" label="Right">
                  <Select
                    id="compare-right"
                    value={String(b)}
                    options={options}
                    onChange={(e) => setPick({ a, b: Number(e.target.value) })}
                  />
                </Field>
              </div>
              {a === b ? (
                <p className="text-ink-soft">Choose two different versions.</p>
              ) : (
                <CharacteristicCompare a={a} b={b} />
              )}
            </section>
          )}
          {draft && (
            <section
              aria-label={`Approve or discard version ${draft.version}`}
              className="flex flex-col gap-3 border-t border-rule pt-4"
            >
              {draft.createdById === me.user.id ? (
                <Notice tone="info">Someone else approves this draft: you drafted it.</Notice>
              ) : me.can('process.approve') ? (
                <SignChange
                  label="Approve and sign"
                  signer={me.user.name}
                  meaning={`approve the change to ${c.name}, version ${draft.version}`}
                  subject={`${c.stage}/${c.code}`}
                  onSign={async (body) => {
                    const v = await approve.mutateAsync({ id: draft.id, ...body });
                    setPick(null);
                    setDone(
                      `Version ${v.version} approved by ${v.approvedBy}; ${v.inForce ? 'in force now' : `in force from ${formatWhen(v.effectiveFrom)}`}.`,
                    );
                  }}
                >
                  The stations ask for it as version {draft.version} defines it from the time it takes effect.
                </SignChange>
              ) : (
                <Notice tone="info">A quality engineer other than its author approves it with their signature.</Notice>
              )}
              <div>
                <Button
                  variant="danger"
                  onClick={() =>
                    discard.mutate(draft.id, {
                      onSuccess: () => {
                        setPick(null);
                        setDone(`Draft version ${draft.version} discarded; it stays on record.`);
                      },
                    })
                  }
                  disabled={discard.isPending}
                >
                  Discard draft version {draft.version}
                </Button>
              </div>
            </section>
          )}
          {list.length > 0 && (
            <section aria-labelledby="char-versions-heading">
              <h3 id="char-versions-heading" className="mb-2 font-semibold">
                Every version
              </h3>
              <ol className="flex flex-col gap-2">
                {list.map((v) => (
                  <li key={v.id} className="rounded-card border border-rule px-3 py-2">
                    <div className="flex flex-wrap items-center gap-2">
                      <span className="font-semibold">Version {v.version}</span>
                      <Badge tone={STATUS[v.status].tone}>{STATUS[v.status].label}</Badge>
                      {v.inForce && <Badge tone="accent">In force</Badge>}
                    </div>
                    <p className="text-sm text-ink-soft">
                      {v.note}
                      {v.createdBy && ` · drafted by ${v.createdBy}`}
                      {v.approvedBy && ` · approved by ${v.approvedBy}, ${formatWhen(v.approvedAt)}`}
                      {v.approvalReason && `: ${v.approvalReason}`}
                    </p>
                  </li>
                ))}
              </ol>
            </section>
          )}
        </div>
      </CardBody>
    </Card>
  );
}
