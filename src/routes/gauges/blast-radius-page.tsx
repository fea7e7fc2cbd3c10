import type { QueryClient } from '@tanstack/react-query';
import { useId, useState, type FormEvent } from 'react';
import { Link, useSearchParams, type LoaderFunctionArgs } from 'react-router';
import {
  blastQuery,
  WHERE_NOW_LABELS,
  type BlastQuery,
  type BlastRadiusJson,
  type ContainmentJson,
} from '../../../shared/schemas/gauges';
import { useSignedIn } from '../../api/auth/me';
import { blastQueryOptions, useBlastRadius, useContain, useCustomerNotice } from '../../api/gauges/gauges';
import { PageHeader } from '../../components/page-header';
import { Badge, type Tone } from '../../components/ui/badge';
import { Button } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Input } from '../../components/ui/input';
import { Notice } from '../../components/ui/notice';
import { Table, TableFrame, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { ApiError } from '../../lib/http';
import { ncrHref, trailHref } from '../../lib/paths';
import { requirePermission } from '../../lib/session';

const queryFrom = (params: URLSearchParams): BlastQuery => {
  const raw = Object.fromEntries(
    [...params.entries()].filter(([k]) =>
      ['gauge', 'lot', 'ruleId', 'operatorId', 'station', 'from', 'to'].includes(k),
    ),
  );
  const parsed = blastQuery.safeParse(raw);
  if (!parsed.success)
    throw new ApiError(400, { code: 'invalid', message: parsed.error.issues[0]?.message ?? 'Say what went bad.' });
  return parsed.data;
};

export const blastLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'containment.read');
    await queryClient.ensureQueryData(blastQueryOptions(queryFrom(new URL(request.url).searchParams)));
    return null;
  };

const WHERE_TONES: Record<string, Tone> = { in_plant: 'wait', on_hold: 'hold', shipped: 'accent', scrapped: 'off' };

function Totals({ b }: { b: BlastRadiusJson }) {
  const t = b.totals;
  const items: [string, number][] = [
    ['Readings', t.readings],
    ['Verdicts that could change', t.couldChange],
    ['Parts', t.parts],
    ['Units', t.units],
    ['In the plant', t.inPlant],
    ['On hold', t.onHold],
    ['Shipped', t.shipped],
    ['Customers', t.customers],
  ];
  return (
    <dl className="grid grid-cols-2 gap-3 sm:grid-cols-4">
      {items.map(([k, v]) => (
        <div key={k} className="rounded-control border border-rule px-3 py-2">
          <dt className="text-xs font-semibold uppercase tracking-wide text-ink-soft">{k}</dt>
          <dd className="font-mono text-2xl tabular-nums">{v}</dd>
        </div>
      ))}
    </dl>
  );
}

function ContainForm({ q, onDone }: { q: BlastQuery; onDone: (c: ContainmentJson) => void }) {
  const contain = useContain();
  const reasonId = useId();
  const defectId = useId();
  const passwordId = useId();
  const [reason, setReason] = useState('');
  const [defectCode, setDefectCode] = useState('OOT');
  const [password, setPassword] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const submit = async (e: FormEvent) => {
    e.preventDefault();
    setProblem(null);
    try {
      onDone(await contain.mutateAsync({ trigger: q, reason, defectCode, fieldActions: true, password }));
    } catch (err) {
      setProblem(err instanceof ApiError ? [err.message, ...Object.values(err.fields)].join(' ') : 'Nothing was held.');
    }
  };
  return (
    <form onSubmit={submit} className="flex flex-col gap-3" aria-label="Hold and open field actions">
      <div className="flex flex-col gap-1">
        <label htmlFor={reasonId} className="text-sm font-semibold">
          Reason
        </label>
        <textarea
          id={reasonId}
          className="min-h-20 rounded-control border border-rule-strong bg-card p-2"
          value={reason}
          onChange={(e) => setReason(e.target.value)}
        />
      </div>
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
        <div className="flex flex-col gap-1">
          <label htmlFor={defectId} className="text-sm font-semibold">
            Defect code
          </label>
          <Input id={defectId} mono value={defectCode} onChange={(e) => setDefectCode(e.target.value)} />
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor={passwordId} className="text-sm font-semibold">
            Password (your signature)
          </label>
          <Input
            id={passwordId}
            type="password"
            autoComplete="current-password"
            value={password}
            onChange={(e) => setPassword(e.target.value)}
          />
        </div>
      </div>
      <p className="text-sm text-ink-soft">
        Signing puts every part above that is still in the plant on hold with an NCR of its own, and opens a field
        action for each shipped unit.
      </p>
      {problem && (
        <Notice tone="bad" title="Nothing was held" live="alert">
          {problem}
        </Notice>
      )}
      <div className="flex justify-end">
        <Button type="submit" variant="primary" disabled={contain.isPending}>
          Sign and hold
        </Button>
      </div>
    </form>
  );
}

function NoticeForm({ c }: { c: ContainmentJson }) {
  const notice = useCustomerNotice();
  const id = useId();
  const [message, setMessage] = useState(
    'A measuring instrument used on this engine was later found out of calibration. Please do not install or run it until we have contacted you.',
  );
  const [result, setResult] = useState<string | null>(null);
  const submit = async (e: FormEvent) => {
    e.preventDefault();
    try {
      const r = await notice.mutateAsync({ number: c.number, message });
      setResult(`${r.sent} notice(s) queued in the mail outbox.`);
    } catch (err) {
      setResult(err instanceof ApiError ? err.message : 'The notice was not queued.');
    }
  };
  return (
    <form onSubmit={submit} className="flex flex-col gap-3" aria-label="Customer notice">
      <label htmlFor={id} className="text-sm font-semibold">
        Notice to the customers
      </label>
      <textarea
        id={id}
        className="min-h-24 rounded-control border border-rule-strong bg-card p-2"
        value={message}
        onChange={(e) => setMessage(e.target.value)}
      />
      {result && (
        <Notice tone="info" live="status">
          {result}
        </Notice>
      )}
      <div className="flex justify-end">
        <Button type="submit" disabled={notice.isPending}>
          Draft the customer notice
        </Button>
      </div>
    </form>
  );
}

export function BlastRadiusPage() {
  const me = useSignedIn();
  const [params] = useSearchParams();
  const q = queryFrom(params);
  const { data: b } = useBlastRadius(q);
  const [contained, setContained] = useState<ContainmentJson | null>(null);
  if (!me || !b) return null;
  const exportHref = (format: 'csv' | 'pdf') =>
    `/api/blast-radius/export?${new URLSearchParams({ ...(Object.fromEntries(Object.entries(q).map(([k, v]) => [k, String(v)])) as Record<string, string>), format })}`;
  return (
    <div className="mx-auto max-w-page">
      <PageHeader
        title="What it touched"
        description={b.trigger.label}
        actions={
          <span className="flex gap-4">
            <a
              className="inline-flex min-h-11 items-center text-accent underline floor:min-h-12"
              href={exportHref('csv')}
            >
              Export CSV
            </a>
            <a
              className="inline-flex min-h-11 items-center text-accent underline floor:min-h-12"
              href={exportHref('pdf')}
            >
              Export PDF
            </a>
          </span>
        }
      />
      <div className="flex flex-col gap-5">
        <Card labelledBy="blast-totals">
          <CardHeader
            id="blast-totals"
            title="At a glance"
            description={
              b.guardBand
                ? `Guard band: the as-found error, ${b.guardBand.error} ${b.guardBand.unit ?? ''}.`
                : undefined
            }
          />
          <CardBody>
            <Totals b={b} />
          </CardBody>
        </Card>
        {b.parts.length < b.totals.parts && (
          <p>
            The {b.parts.length.toLocaleString()} parts most in doubt of {b.totals.parts.toLocaleString()}; the CSV
            export has every reading with its part.
          </p>
        )}
        <TableFrame label="Parts and where they are">
          <Table caption="Parts measured, and where each is now">
            <THead>
              <TR>
                <TH>Part</TH>
                <TH align="right">Readings</TH>
                <TH align="right">Could change</TH>
                <TH>Unit</TH>
                <TH>Where now</TH>
                <TH>Customer</TH>
                <TH wideOnly>Shipped</TH>
              </TR>
            </THead>
            <TBody>
              {b.parts.map((p) => (
                <TR key={p.serial}>
                  <TD mono nowrap>
                    <Link to={trailHref(p.serial)} className="text-accent underline">
                      {p.serial}
                    </Link>
                  </TD>
                  <TD mono align="right">
                    {p.readings}
                  </TD>
                  <TD mono align="right">
                    {p.couldChange}
                  </TD>
                  <TD mono nowrap>
                    {p.unit ?? '—'}
                  </TD>
                  <TD>
                    <Badge tone={WHERE_TONES[p.where]}>{WHERE_NOW_LABELS[p.where]}</Badge>
                  </TD>
                  <TD>{p.customer ?? '—'}</TD>
                  <TD mono nowrap wideOnly>
                    {p.shipDate ? `${p.shipDate} (${p.order})` : '—'}
                  </TD>
                </TR>
              ))}
            </TBody>
          </Table>
        </TableFrame>
        <Card labelledBy="blast-customers">
          <CardHeader id="blast-customers" title="Shipped to" />
          <CardBody>
            {b.customers.length ? (
              <ul className="flex flex-col gap-1">
                {b.customers.map((c) => (
                  <li key={c.name}>
                    <strong>{c.name}</strong>:{' '}
                    {c.units.map((u) => `${u.serial} on ${u.shipDate} (order ${u.order})`).join('; ')}
                  </li>
                ))}
              </ul>
            ) : (
              <p>Nothing in the blast radius has shipped.</p>
            )}
          </CardBody>
        </Card>
        {me.can('containment.act') && (
          <Card labelledBy="blast-contain">
            <CardHeader id="blast-contain" title="Hold what is in the plant" />
            <CardBody>
              {contained ? (
                <div className="flex flex-col gap-4">
                  <Notice
                    tone="ok"
                    title={`Containment ${contained.number} signed by ${contained.signedBy}`}
                    live="status"
                  >
                    {contained.held.filter((h) => h.outcome === 'held' || h.outcome === 'already_held').length} part(s)
                    on hold; {contained.fieldActions.length} field action(s) opened.
                  </Notice>
                  <ul className="flex flex-wrap gap-3">
                    {contained.held.map((h) => (
                      <li key={h.serial} className="font-mono">
                        {h.serial}:{' '}
                        {h.ncr ? (
                          <Link to={ncrHref(h.ncr)} className="text-accent underline">
                            {h.ncr}
                          </Link>
                        ) : (
                          h.outcome
                        )}
                      </li>
                    ))}
                  </ul>
                  {contained.fieldActions.length > 0 && <NoticeForm c={contained} />}
                </div>
              ) : (
                <ContainForm q={q} onDone={setContained} />
              )}
            </CardBody>
          </Card>
        )}
        <TableFrame label="Readings">
          <Table
            caption={`The first ${b.readings.length} of ${b.totals.readings} readings, most doubtful first (all in the CSV)`}
          >
            <THead>
              <TR>
                <TH>Part</TH>
                <TH>Characteristic</TH>
                <TH>Position</TH>
                <TH align="right">Value</TH>
                <TH>Limits</TH>
                <TH>Verdict</TH>
                <TH wideOnly>Taken</TH>
              </TR>
            </THead>
            <TBody>
              {b.readings.map((r, i) => (
                <TR key={i}>
                  <TD mono nowrap>
                    {r.serial}
                  </TD>
                  <TD>{r.characteristic}</TD>
                  <TD mono>{r.position}</TD>
                  <TD mono align="right">
                    {r.value ?? '—'} {r.unit ?? ''}
                  </TD>
                  <TD mono nowrap>
                    {r.lower ?? '…'} to {r.upper ?? '…'}
                  </TD>
                  <TD>
                    {r.couldChange ? (
                      <Badge tone="hold">Could change</Badge>
                    ) : (
                      <Badge tone={r.verdict === 'pass' ? 'ok' : 'bad'}>{r.verdict === 'pass' ? 'Pass' : 'Fail'}</Badge>
                    )}
                  </TD>
                  <TD mono nowrap wideOnly>
                    {r.takenAt.slice(0, 16).replace('T', ' ')}
                  </TD>
                </TR>
              ))}
            </TBody>
          </Table>
        </TableFrame>
      </div>
    </div>
  );
}
