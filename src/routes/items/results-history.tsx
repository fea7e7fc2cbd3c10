import type { ReactNode } from 'react';
import { Link } from 'react-router';
import { useItemResults, type ItemResult } from '../../api/items/results';
import { ReadingsTable, valueText } from '../../components/readings-table';
import { Badge } from '../../components/ui/badge';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import { formatWhen, plural } from '../../lib/format';
import { ncrHref } from '../../lib/paths';

function Facts({ result }: { result: ItemResult }) {
  const ncr = result.nonconformance;
  const rows: [string, ReactNode, boolean][] = [
    ['Finished', formatWhen(result.finishedAt), true],
    ['Operator', result.operator || '—', false],
    ['Station', result.station ? `${result.station.name} (${result.station.code})` : '—', false],
    ['Gauge', result.gauge ?? 'None recorded', result.gauge !== null],
  ];
  if (ncr) {
    rows.push([
      'NCR',
      <Link key="ncr" to={ncrHref(ncr.number)} className="text-accent underline underline-offset-4">
        {ncr.number} ({ncr.severity})
      </Link>,
      true,
    ]);
  }
  return (
    <dl className={`grid grid-cols-2 gap-x-5 gap-y-2 ${ncr ? 'sm:grid-cols-5' : 'sm:grid-cols-4'}`}>
      {rows.map(([k, v, mono]) => (
        <div key={k} className="min-w-0">
          <dt className="text-xs font-semibold uppercase tracking-wide text-ink-soft">{k}</dt>
          <dd className={mono ? 'font-mono' : ''}>{v}</dd>
        </div>
      ))}
    </dl>
  );
}

/** Another result named by when it was recorded, never by its row number. */
const recordedWhen = (r: ItemResult | undefined) =>
  r ? `${r.stage.name} result of ${formatWhen(r.finishedAt)}` : 'an earlier result';

function ResultEntry({ result, byId }: { result: ItemResult; byId: Map<number, ItemResult> }) {
  const passed = result.verdict === 'pass';
  const headingId = `result-${result.id}`;
  const replaced = result.supersededBy !== null;
  return (
    <article
      aria-labelledby={headingId}
      className={`flex flex-col gap-3 rounded-control border px-4 py-3 ${replaced ? 'border-dashed border-rule-strong bg-sunk' : passed ? 'border-rule bg-card' : 'border-2 border-bad bg-card'}`}
    >
      <header className="flex flex-wrap items-start justify-between gap-x-4 gap-y-1.5">
        <h3 id={headingId} className="flex items-center gap-2 text-lg font-semibold">
          <Icon name={passed ? 'ok' : 'bad'} size={20} className={passed ? 'text-ok' : 'text-bad'} />
          {result.stage.name} — {passed ? 'Passed' : 'Failed'}
        </h3>
        <div className="flex flex-wrap items-center gap-2">
          {replaced && (
            <Badge tone="off">
              Superseded by the correction of {formatWhen(byId.get(result.supersededBy!)?.finishedAt)}
            </Badge>
          )}
          <time className="font-mono text-sm text-ink-soft" dateTime={result.finishedAt}>
            {formatWhen(result.finishedAt)}
          </time>
        </div>
      </header>
      <Facts result={result} />
      {result.supersedes !== null && (
        <p>
          <span className="font-medium">Correction of the {recordedWhen(byId.get(result.supersedes))}</span>
          {result.correctionReason && <>: {result.correctionReason}</>}
        </p>
      )}
      {result.reentryReason && (
        <p>
          <span className="font-medium">Re-entry: </span>
          {result.reentryReason}
        </p>
      )}
      {result.notes && (
        <p>
          <span className="font-medium">Notes: </span>
          {result.notes}
        </p>
      )}
      {result.failing.length > 0 && (
        <div className="rounded-control border-l-4 border-bad bg-bad-tint px-3 py-2">
          <p className="font-semibold text-bad">Failing readings ({result.failing.length})</p>
          <ul className="mt-1 flex flex-col gap-0.5">
            {result.failing.slice(0, 6).map((r, i) => (
              <li key={`${r.characteristic}/${r.position}/${i}`}>
                {r.name}, {r.positionLabel}: <span className="font-mono font-semibold">{valueText(r)}</span>
              </li>
            ))}
            {result.failing.length > 6 && (
              <li className="text-ink-soft">and {result.failing.length - 6} more below.</li>
            )}
          </ul>
        </div>
      )}
      {result.photos.length > 0 && (
        <ul className="flex flex-wrap gap-2" aria-label={`Photos of the ${recordedWhen(result)}`}>
          {result.photos.map((p, i) => (
            <li key={p.id}>
              <a href={p.url} target="_blank" rel="noopener" className="block rounded-control">
                <img
                  src={p.url}
                  alt={`Photo ${i + 1} of the ${recordedWhen(result)}: ${p.fileName}`}
                  className="aspect-[4/3] w-28 rounded-control border border-rule-strong bg-sunk object-cover"
                />
              </a>
            </li>
          ))}
        </ul>
      )}
      {result.readings.length > 0 && (
        <details className="group">
          <summary className="inline-flex min-h-9 cursor-pointer list-none items-center gap-1.5 rounded-control font-medium text-accent hover:underline floor:min-h-12 [&::-webkit-details-marker]:hidden">
            <Icon name="chevronRight" size={18} className="transition-transform group-open:rotate-90" />
            Readings ({result.readings.length})
          </summary>
          <div className="mt-2">
            <ReadingsTable
              readings={result.readings}
              caption={`Readings of the ${result.stage.name} result of ${formatWhen(result.finishedAt)}`}
            />
          </div>
        </details>
      )}
    </article>
  );
}

/** Every pass of the item through a station, newest first; a corrected result stays, marked. */
export function ResultsHistory({ serial }: { serial: string }) {
  const results = useItemResults(serial);
  const list = results.data ?? [];
  const byId = new Map(list.map((r) => [r.id, r]));
  return (
    <Card labelledBy="results-heading">
      <CardHeader
        id="results-heading"
        title="Station results"
        description={
          results.data
            ? `${plural(list.length, 'result')}, newest first. Each reading keeps the rule version it was judged by.`
            : undefined
        }
      />
      <CardBody>
        {results.error ? (
          <Notice tone="bad" live="alert">
            {results.error.message}
          </Notice>
        ) : results.isPending ? (
          <p className="text-ink-soft">Loading results…</p>
        ) : list.length === 0 ? (
          <p className="text-ink-soft">No station has recorded a result for this item yet.</p>
        ) : (
          <div className="flex flex-col gap-3">
            {list.map((r) => (
              <ResultEntry key={r.id} result={r} byId={byId} />
            ))}
          </div>
        )}
      </CardBody>
    </Card>
  );
}
