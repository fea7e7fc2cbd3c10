import { memo, useCallback, useId, useMemo, useState } from 'react';
import type { TrailNode, TrailResult } from '../../../shared/schemas/trail';
import { Badge } from '../../components/ui/badge';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Field } from '../../components/ui/field';
import { Icon } from '../../components/ui/icon';
import { Select } from '../../components/ui/select';
import { EmptyRow, Table, TableFrame, TBody, TD, TH, THead } from '../../components/ui/table';
import { formatWhen, plural } from '../../lib/format';
import { partName } from '../../lib/item-status';
import { useUrlFilter } from '../../lib/use-url-filter';
import { serialsOf } from './genealogy';
import { ReadingsTable } from '../../components/readings-table';

const COLUMNS = 6;

function Details({ r }: { r: TrailResult }) {
  return (
    <div className="flex flex-col gap-3">
      {r.supersedes !== null && (
        <p>
          <span className="font-medium">Corrects the earlier {r.stage.name} result of this part</span>
          {r.correctionReason && <>: {r.correctionReason}</>}
        </p>
      )}
      {r.reentryReason && (
        <p>
          <span className="font-medium">Re-entry: </span>
          {r.reentryReason}
        </p>
      )}
      {r.photos.length > 0 && (
        <ul
          className="flex flex-wrap gap-2"
          aria-label={`Photos of the ${r.stage.name} result of ${formatWhen(r.finishedAt)}`}
        >
          {r.photos.map((p, i) => (
            <li key={p.id}>
              <a href={p.url} target="_blank" rel="noopener" className="block rounded-control">
                <img
                  src={p.url}
                  loading="lazy"
                  alt={`Photo ${i + 1} of the ${r.stage.name} result: ${p.fileName}`}
                  className="aspect-[4/3] w-28 rounded-control border border-rule-strong bg-sunk object-cover"
                />
              </a>
            </li>
          ))}
        </ul>
      )}
      {r.readings.length > 0 ? (
        <ReadingsTable
          readings={r.readings}
          caption={`Readings of result ${r.id}: ${r.stage.name}, ${r.serial}`}
          limits
        />
      ) : (
        <p className="text-ink-soft">No readings were recorded with this result.</p>
      )}
    </div>
  );
}

type RowProps = { r: TrailResult; kind: string; open: boolean; onToggle: (id: number) => void };

/** One result as one row; its readings table is built only once it is opened. */
const ResultRow = memo(function ResultRow({ r, kind, open, onToggle }: RowProps) {
  const passed = r.verdict === 'pass';
  const replaced = r.supersededBy !== null;
  const detailsId = `result-${r.id}-details`;
  const when = formatWhen(r.finishedAt);
  const extra = r.readings.length > 0 || r.photos.length > 0 || r.supersedes !== null || r.reentryReason;
  return (
    <>
      <tr className={`hover:bg-sunk/60 ${replaced ? 'text-ink-soft' : ''} ${passed ? '' : 'bg-bad-tint/50'}`}>
        <TD mono nowrap>
          {when}
        </TD>
        <TD nowrap>
          <span className="block font-mono font-semibold text-ink">{r.serial}</span>
          <span className="block text-sm text-ink-soft">{kind}</span>
        </TD>
        <TD>{r.stage.name}</TD>
        <TD>
          <span className="flex flex-col items-start gap-1">
            <Badge tone={passed ? 'ok' : 'bad'}>{passed ? 'Passed' : 'Failed'}</Badge>
            {replaced && <Badge tone="off">Superseded by a correction</Badge>}
            {r.supersedes !== null && <span className="text-sm">A correction</span>}
          </span>
        </TD>
        <TD>
          <span className="block">{r.operator || '—'}</span>
          {(r.station || r.gauge) && (
            <span className="block text-sm text-ink-soft">
              {r.station && (
                <span className="whitespace-nowrap">
                  Station <span className="font-mono">{r.station}</span>
                </span>
              )}
              {r.station && r.gauge && ' · '}
              {r.gauge && (
                <span className="whitespace-nowrap">
                  Gauge <span className="font-mono">{r.gauge}</span>
                </span>
              )}
            </span>
          )}
        </TD>
        <TD nowrap>
          {extra ? (
            <button
              type="button"
              aria-expanded={open}
              aria-controls={open ? detailsId : undefined}
              onClick={() => onToggle(r.id)}
              className="inline-flex min-h-9 items-center gap-1 rounded-control px-1 font-medium text-accent hover:underline floor:min-h-12"
            >
              <Icon name={open ? 'chevronDown' : 'chevronRight'} size={18} />
              Readings ({r.readings.length})
              <span className="sr-only">
                {' '}
                of {r.stage.name} on {r.serial}, {when}
              </span>
            </button>
          ) : (
            <span className="text-ink-soft">None</span>
          )}
        </TD>
      </tr>
      {open && (
        <tr id={detailsId}>
          <td colSpan={COLUMNS} className="border-b border-rule bg-sunk px-5 py-3">
            <Details r={r} />
          </td>
        </tr>
      )}
    </>
  );
});

const VERDICTS = [
  { value: '', label: 'Passed and failed' },
  { value: 'fail', label: 'Failed only' },
  { value: 'pass', label: 'Passed only' },
];
const ORDERS = [
  { value: '', label: 'Oldest first' },
  { value: 'newest', label: 'Newest first' },
];

/** Every stage result of every serial in the genealogy, in time order, filterable by part. */
export function TrailResults({ results, tree }: { results: TrailResult[]; tree: TrailNode }) {
  const id = useId();
  const { params, set } = useUrlFilter();
  const part = params.get('part') ?? '';
  const verdict = params.get('verdict') ?? '';
  const order = params.get('order') ?? '';
  const [open, setOpen] = useState<ReadonlySet<number>>(() => new Set());
  const onToggle = useCallback(
    (rid: number) =>
      setOpen((s) => {
        const next = new Set(s);
        if (!next.delete(rid)) next.add(rid);
        return next;
      }),
    [],
  );

  const nodes = useMemo(() => serialsOf(tree), [tree]);
  const kindOf = useMemo(() => new Map(nodes.map((n) => [n.serial, partName(n.kindLabel, n.positionLabel)])), [nodes]);
  const counts = useMemo(() => {
    const m = new Map<string, number>();
    for (const r of results) m.set(r.serial, (m.get(r.serial) ?? 0) + 1);
    return m;
  }, [results]);
  const shown = useMemo(() => {
    const list = results.filter((r) => (!part || r.serial === part) && (!verdict || r.verdict === verdict));
    return order === 'newest' ? list.reverse() : list;
  }, [results, part, verdict, order]);

  const partOptions = [
    { value: '', label: `All parts (${results.length})` },
    ...nodes
      .filter((n) => counts.has(n.serial))
      .map((n) => ({ value: n.serial, label: `${n.serial} — ${kindOf.get(n.serial)} (${counts.get(n.serial)})` })),
  ];

  return (
    <Card labelledBy="results-heading">
      <CardHeader
        id="results-heading"
        title="Stage results"
        description="Every result of the unit, its parts and their cores. Each reading keeps the rule version it was judged by."
      />
      <CardBody>
        <div className="flex flex-wrap items-end gap-3">
          <div className="min-w-56 flex-1">
            <Field id={`${id}-part`} label="Part">
              <Select
                id={`${id}-part`}
                options={partOptions}
                value={part}
                onChange={(e) => set('part', e.target.value)}
              />
            </Field>
          </div>
          <div className="w-44">
            <Field id={`${id}-verdict`} label="Verdict">
              <Select
                id={`${id}-verdict`}
                options={VERDICTS}
                value={verdict}
                onChange={(e) => set('verdict', e.target.value)}
              />
            </Field>
          </div>
          <div className="w-40">
            <Field id={`${id}-order`} label="Order">
              <Select
                id={`${id}-order`}
                options={ORDERS}
                value={order}
                onChange={(e) => set('order', e.target.value)}
              />
            </Field>
          </div>
          <p aria-live="polite" className="ml-auto pb-2 text-sm text-ink-soft">
            {shown.length === results.length
              ? plural(results.length, 'result')
              : `${plural(shown.length, 'result')} of ${results.length}`}
          </p>
        </div>
      </CardBody>
      <TableFrame label="Stage results list">
        <Table caption="Stage results">
          <THead>
            <tr>
              <TH>When</TH>
              <TH>Part</TH>
              <TH>Stage</TH>
              <TH>Verdict</TH>
              <TH>Operator, station, gauge</TH>
              <TH>Readings</TH>
            </tr>
          </THead>
          <TBody>
            {shown.length === 0 && (
              <EmptyRow colSpan={COLUMNS}>
                {results.length ? 'No result matches these filters.' : 'No station has recorded a result yet.'}
              </EmptyRow>
            )}
            {shown.map((r) => (
              <ResultRow key={r.id} r={r} kind={kindOf.get(r.serial) ?? ''} open={open.has(r.id)} onToggle={onToggle} />
            ))}
          </TBody>
        </Table>
      </TableFrame>
    </Card>
  );
}
