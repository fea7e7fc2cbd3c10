import { useState } from 'react';
import { Link } from 'react-router';
import { z } from 'zod';
import {
  addSourceBody,
  containmentLinkBody,
  evidenceBody,
  updateCaBody,
  type CaJson,
} from '../../../shared/schemas/corrective-action';
import { useAddSource } from '../../api/corrective-actions/add-source';
import { useAttachEvidence } from '../../api/corrective-actions/attach-evidence';
import { useLinkContainment } from '../../api/corrective-actions/link-containment';
import { useUpdateCa } from '../../api/corrective-actions/update-ca';
import { Form, SubmitButton } from '../../components/form';
import { TextAreaField, TextField } from '../../components/form-fields';
import { PhotoField } from '../../components/photo-field';
import { Badge } from '../../components/ui/badge';
import { Button } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { formatWhen } from '../../lib/format';
import { fieldActionHref, ncrHref, trailHref } from '../../lib/paths';
import { sourceHref } from './ca-words';

type TextKey = 'problem' | 'containment' | 'rootCause';

/**
 * One written part of the record: read as it stands, and rewritten in place by quality while the
 * record is open. Every save is audited with what it said before.
 */
export function WrittenPart({
  ca,
  field,
  label,
  empty,
  hint,
  editable,
}: {
  ca: CaJson;
  field: TextKey;
  label: string;
  empty: string;
  hint: string;
  editable: boolean;
}) {
  const [editing, setEditing] = useState(false);
  const update = useUpdateCa();
  const text = ca[field];
  if (editing) {
    const schema = z.strictObject({ [field]: updateCaBody.shape[field].unwrap() });
    return (
      <Form
        schema={schema}
        defaultValues={{ [field]: text }}
        onSubmit={async (body) => {
          await update.mutateAsync({ number: ca.number, body });
          setEditing(false);
        }}
      >
        <TextAreaField name={field} label={label} hint={hint} />
        <div className="flex justify-end gap-2">
          <Button onClick={() => setEditing(false)}>Cancel</Button>
          <SubmitButton>Save</SubmitButton>
        </div>
      </Form>
    );
  }
  return (
    <div className="flex flex-col gap-2">
      {text.trim() ? (
        <p className="max-w-prose whitespace-pre-line">{text}</p>
      ) : (
        <p className="text-ink-soft">{empty}</p>
      )}
      {editable && (
        <div>
          <Button size="sm" onClick={() => setEditing(true)} aria-label={`Write the ${label.toLowerCase()}`}>
            {text.trim() ? 'Rewrite' : 'Write it'}
          </Button>
        </div>
      )}
    </div>
  );
}

const sourceForm = z.object({ number: z.string().trim().toUpperCase() }).superRefine((b, ctx) => {
  if (!/^(NC|WC)-\d{4}-\d{5,}$/.test(b.number)) {
    ctx.addIssue({ code: 'custom', path: ['number'], message: 'An NCR (NC-2026-00007) or a claim (WC-2026-00007).' });
  }
});

export function Sources({ ca, editable }: { ca: CaJson; editable: boolean }) {
  const add = useAddSource();
  const [round, setRound] = useState(0);
  return (
    <Card labelledBy="ca-sources">
      <CardHeader id="ca-sources" title="Where it came from" description="The NCRs and claims this record answers." />
      <CardBody>
        <ul className="flex flex-col divide-y divide-rule">
          {ca.sourceList.map((s) => (
            <li key={s.number} className="flex flex-wrap items-baseline gap-x-3 py-2">
              <Link to={sourceHref(s.number)} className="font-mono font-semibold text-accent underline">
                {s.number}
              </Link>
              <Badge tone="neutral">{s.state.replace(/_/g, ' ')}</Badge>
              {s.kind === 'ncr' ? (
                <span>
                  <span className="font-mono">{s.subject}</span> · {s.description}
                </span>
              ) : (
                <span>
                  Unit{' '}
                  <Link to={trailHref(s.unit)} className="font-mono text-accent underline">
                    {s.unit}
                  </Link>{' '}
                  · {s.symptom}
                </span>
              )}
            </li>
          ))}
        </ul>
        {editable && (
          <div className="mt-3 border-t border-rule pt-3">
            <Form
              key={round}
              schema={sourceForm}
              defaultValues={{ number: '' }}
              onSubmit={async ({ number }) => {
                const body = addSourceBody.parse(number.startsWith('NC-') ? { ncr: number } : { claim: number });
                await add.mutateAsync({ number: ca.number, body });
                setRound((r) => r + 1);
              }}
            >
              <div className="grid grid-cols-1 items-start gap-3 sm:grid-cols-[minmax(0,20rem)_auto]">
                <TextField name="number" label="Add an NCR or claim" mono placeholder="NC-… or WC-…" />
                <div className="sm:pt-6">
                  <SubmitButton>Add</SubmitButton>
                </div>
              </div>
            </Form>
          </div>
        )}
      </CardBody>
    </Card>
  );
}

const linkForm = z
  .object({ number: z.string().trim().toUpperCase(), note: containmentLinkBody.shape.note })
  .superRefine((b, ctx) => {
    if (!/^(NC|FA)-\d{4}-\d{5,}$/.test(b.number)) {
      ctx.addIssue({
        code: 'custom',
        path: ['number'],
        message: 'The NCR holding the part or lot (NC-…), or a field action (FA-…).',
      });
    }
  });

export function Containment({ ca, editable }: { ca: CaJson; editable: boolean }) {
  const link = useLinkContainment();
  const [round, setRound] = useState(0);
  return (
    <Card labelledBy="ca-containment">
      <CardHeader
        id="ca-containment"
        title="Containment"
        description="What keeps the problem from reaching more customers until the cause is removed: holds on parts and lots, and field actions on shipped units."
      />
      <CardBody>
        <WrittenPart
          ca={ca}
          field="containment"
          label="Containment"
          empty="Nothing written yet."
          hint="What was held, sorted or recalled, and where: stock, the line, the field."
          editable={editable}
        />
        {ca.containmentLinks.length > 0 && (
          <ul className="mt-3 flex flex-col gap-2 border-t border-rule pt-3" aria-label="Holds and field actions">
            {ca.containmentLinks.map((l) => (
              <li key={`${l.kind}-${l.number}`} className="flex flex-wrap items-baseline gap-x-2">
                <Badge tone={l.kind === 'hold' ? 'hold' : 'wait'}>{l.kind === 'hold' ? 'Hold' : 'Field action'}</Badge>
                <Link
                  to={l.kind === 'hold' ? ncrHref(l.number) : fieldActionHref(l.number)}
                  className="font-mono font-semibold text-accent underline"
                >
                  {l.number}
                </Link>
                <span className="text-ink-soft">({l.state.replace(/_/g, ' ')})</span>
                <span className="font-mono">{l.subject}</span>
                {l.note && <span>· {l.note}</span>}
                <span className="text-sm text-ink-soft">
                  {l.addedBy} · <span className="font-mono">{formatWhen(l.addedAt)}</span>
                </span>
              </li>
            ))}
          </ul>
        )}
        {editable && (
          <div className="mt-3 border-t border-rule pt-3">
            <Form
              key={round}
              schema={linkForm}
              defaultValues={{ number: '', note: '' }}
              onSubmit={async ({ number, note }) => {
                const body = number.startsWith('NC-') ? { ncr: number, note } : { fieldAction: number, note };
                await link.mutateAsync({ number: ca.number, body });
                setRound((r) => r + 1);
              }}
            >
              <div className="grid grid-cols-1 items-start gap-3 md:grid-cols-[minmax(0,16rem)_minmax(0,1fr)_auto]">
                <TextField name="number" label="Link a hold or field action" mono placeholder="NC-… or FA-…" />
                <TextField name="note" label="Note" hint="What it contains." />
                <div className="md:pt-6">
                  <SubmitButton>Link</SubmitButton>
                </div>
              </div>
            </Form>
          </div>
        )}
      </CardBody>
    </Card>
  );
}

export function RootCause({ ca, editable }: { ca: CaJson; editable: boolean }) {
  const attach = useAttachEvidence();
  const [round, setRound] = useState(0);
  return (
    <Card labelledBy="ca-root">
      <CardHeader
        id="ca-root"
        title="Root cause"
        description="Why it happened, and why it was not caught, with the evidence that shows it."
      />
      <CardBody>
        <WrittenPart
          ca={ca}
          field="rootCause"
          label="Root cause"
          empty="Not found yet."
          hint="The cause the evidence shows, and why the plant's checks let it through."
          editable={editable}
        />
        {ca.evidence.length > 0 && (
          <ul aria-label="Evidence" className="mt-3 flex flex-wrap gap-3 border-t border-rule pt-3">
            {ca.evidence.map((a) => (
              <li key={a.id}>
                <a href={a.url} target="_blank" rel="noreferrer" className="flex flex-col gap-1 text-sm text-accent">
                  {a.mimeType.startsWith('image/') ? (
                    <img
                      src={a.url}
                      alt={a.fileName}
                      className="h-24 w-32 rounded-control border border-rule-strong object-cover"
                    />
                  ) : (
                    <span className="flex h-24 w-32 items-center justify-center break-all rounded-control border border-rule-strong bg-sunk p-2 text-center font-mono">
                      PDF
                    </span>
                  )}
                  <span className="max-w-32 truncate underline">{a.fileName}</span>
                </a>
              </li>
            ))}
          </ul>
        )}
        {editable && (
          <div className="mt-3 border-t border-rule pt-3">
            <Form
              key={round}
              schema={evidenceBody}
              defaultValues={{ attachmentIds: [] }}
              onSubmit={async (body) => {
                await attach.mutateAsync({ number: ca.number, body });
                setRound((r) => r + 1);
              }}
            >
              <PhotoField
                name="attachmentIds"
                label="Evidence"
                max={12}
                documents
                hint="Photos (JPEG, PNG, WebP) or PDF reports, up to 8 MB each."
              />
              <div className="flex justify-end">
                <SubmitButton>Attach as evidence</SubmitButton>
              </div>
            </Form>
          </div>
        )}
      </CardBody>
    </Card>
  );
}
