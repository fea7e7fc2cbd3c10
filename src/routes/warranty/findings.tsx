import type { BuiltReading, BuiltResult, FindingJson, MeasurementJson } from '../../../shared/schemas/warranty';
import { Badge } from '../../components/ui/badge';
import { Icon } from '../../components/ui/icon';
import { Table, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { formatWhen, sharedDecimals } from '../../lib/format';
import { itemHref, lotHref } from '../../lib/paths';
import { Link } from 'react-router';

const num = (v: number, d: number) => v.toFixed(d).replace('-', '−');

function limits(r: BuiltReading, d: number) {
  const unit = r.unit ? ` ${r.unit}` : '';
  if (r.lower !== null && r.upper !== null) return `${num(r.lower, d)} – ${num(r.upper, d)}${unit}`;
  if (r.lower !== null) return `at least ${num(r.lower, d)}${unit}`;
  if (r.upper !== null) return `at most ${num(r.upper, d)}${unit}`;
  return r.value === null && r.passed !== null ? 'Pass required' : '—';
}

function value(r: { value: number | null; passed?: boolean | null; unit: string | null }, d: number) {
  if (r.value === null) return r.passed === null || r.passed === undefined ? '—' : r.passed ? 'Pass' : 'Fail';
  return `${num(r.value, d)}${r.unit ? ` ${r.unit}` : ''}`;
}

function Subject({ f, canTrail }: { f: FindingJson; canTrail: boolean }) {
  const s = f.subject;
  if (s.kind === 'lot') {
    return (
      <>
        Lot{' '}
        {canTrail ? (
          <Link to={lotHref(s.lotCode)} className="font-mono text-accent underline">
            {s.lotCode}
          </Link>
        ) : (
          <span className="font-mono">{s.lotCode}</span>
        )}{' '}
        <span className="font-normal text-ink-soft">
          {s.partKind.replace(/_/g, ' ')} · {s.supplier} · {s.partNumber}
        </span>
      </>
    );
  }
  return (
    <>
      {s.kindLabel}
      {s.positionLabel ? ` (${s.positionLabel})` : ''}{' '}
      <Link to={itemHref(s.serial)} className="font-mono text-accent underline">
        {s.serial}
      </Link>
      {s.core && (
        <span className="font-normal text-ink-soft">
          {' '}
          · from core <span className="font-mono">{s.core}</span>
        </span>
      )}
    </>
  );
}

/**
 * A value measured again at teardown, judged against the limits the part was built to: outside
 * them it says so in a word and a mark as well as in colour. The build's own verdict is not changed.
 */
function Again({ m, r, decimals }: { m: MeasurementJson; r: BuiltReading; decimals: number }) {
  const outside = (r.lower !== null && m.value < r.lower) || (r.upper !== null && m.value > r.upper);
  return (
    <span className={`inline-flex items-center gap-1 ${outside ? 'font-semibold text-bad' : ''}`}>
      {outside && <Icon name="bad" size={15} />}
      {value(m, decimals)}
      {outside && <span className="font-sans text-xs">outside the limits</span>}
    </span>
  );
}

/** One stage result from when the part was built, its readings beside any taken again at teardown. */
function BuiltResultBlock({ r, f, open }: { r: BuiltResult; f: FindingJson; open: boolean }) {
  const again = new Map(f.measurements.map((m) => [`${m.characteristic}@${m.position}`, m]));
  const decimals = sharedDecimals(
    r.readings.flatMap((x) => [x.value, x.lower, x.upper].filter((v): v is number => v !== null)),
    0,
    5,
  );
  return (
    <details open={open} className="rounded-control border border-rule bg-card">
      <summary className="flex min-h-11 floor:min-h-12 cursor-pointer flex-wrap items-center gap-x-3 gap-y-1 px-3 py-2">
        <span className="font-semibold">{r.stage.name}</span>
        {r.verdict === 'pass' ? <Badge tone="ok">Passed</Badge> : <Badge tone="bad">Failed</Badge>}
        {r.superseded && <Badge tone="off">Corrected since</Badge>}
        <span className="text-sm text-ink-soft">
          <span className="font-mono">{r.station ?? '—'}</span> · {r.operator} · gauge{' '}
          <span className="font-mono">{r.gauge ?? '—'}</span> ·{' '}
          <span className="font-mono">{formatWhen(r.finishedAt)}</span>
        </span>
      </summary>
      {r.readings.length > 0 && (
        <div className="overflow-x-auto border-t border-rule">
          <Table caption={`${r.stage.name}: readings when built`}>
            <THead>
              <TR>
                <TH>Characteristic</TH>
                <TH>Position</TH>
                <TH align="right">Built</TH>
                <TH align="right">At teardown</TH>
                <TH align="right">Limits</TH>
                <TH>Rule</TH>
                <TH>Gauge</TH>
              </TR>
            </THead>
            <TBody>
              {r.readings.map((x) => {
                const m = again.get(`${x.characteristic}@${x.position}`);
                return (
                  <tr
                    key={`${x.characteristic}/${x.position}`}
                    className={m ? 'bg-hold-tint font-medium' : x.verdict === 'fail' ? 'bg-bad-tint' : ''}
                  >
                    <TD>
                      <span className="inline-flex items-center gap-1.5">
                        {m && (
                          <Icon
                            name="stepNow"
                            size={16}
                            className="shrink-0 text-hold"
                            label="Measured again at teardown"
                          />
                        )}
                        {x.name}
                      </span>
                    </TD>
                    <TD>{x.positionLabel}</TD>
                    <TD align="right" mono nowrap>
                      {value(x, decimals)}
                    </TD>
                    <TD align="right" mono nowrap>
                      {m && <Again m={m} r={x} decimals={decimals} />}
                    </TD>
                    <TD align="right" mono nowrap>
                      {limits(x, decimals)}
                    </TD>
                    <TD mono nowrap>
                      {x.ruleVersion === null ? '—' : `v${x.ruleVersion}`}
                    </TD>
                    <TD mono nowrap>
                      {x.gauge ?? r.gauge ?? '—'}
                    </TD>
                  </tr>
                );
              })}
            </TBody>
          </Table>
        </div>
      )}
    </details>
  );
}

/** A finding at teardown, and beside it what was measured on that part when it was built. */
export function Finding({ f, index, canTrail }: { f: FindingJson; index: number; canTrail: boolean }) {
  const measured = new Set(f.measurements.map((m) => m.characteristic));
  const current = f.built.filter((r) => !r.superseded);
  const openOf = (r: BuiltResult) =>
    r.readings.some((x) => measured.has(x.characteristic)) || (!measured.size && r === current.at(-1));
  return (
    <article
      aria-labelledby={`finding-${f.id}`}
      className="grid grid-cols-1 gap-4 border-t border-rule px-5 py-4 first:border-t-0 xl:grid-cols-[minmax(0,1fr)_minmax(0,2fr)]"
    >
      {/* on a wide screen the finding stays in view beside the long build records */}
      <section aria-label={`Finding ${index + 1} at teardown`} className="self-start xl:sticky xl:top-4">
        <h3 id={`finding-${f.id}`} className="text-base font-semibold">
          <span className="text-ink-soft">Finding {index + 1} · </span>
          <Subject f={f} canTrail={canTrail} />
        </h3>
        <p className="mt-1 flex flex-wrap items-center gap-2">
          <Badge tone={f.cause.countsAsFailure ? 'bad' : 'neutral'} icon={f.cause.countsAsFailure ? 'bad' : null}>
            {f.cause.code}
          </Badge>
          <span>{f.cause.description}</span>
          {!f.cause.countsAsFailure && <span className="text-sm text-ink-soft">(not counted as a failure)</span>}
        </p>
        <p className="mt-2 max-w-prose whitespace-pre-line">{f.description}</p>
        {f.measurements.length > 0 && (
          <ul className="mt-2 flex flex-col gap-1" aria-label="Measured at teardown">
            {f.measurements.map((m) => (
              <li key={`${m.characteristic}/${m.position}`} className="text-sm">
                {m.name}, {m.positionLabel}:{' '}
                <span className="font-mono font-semibold">
                  {m.value} {m.unit ?? ''}
                </span>
              </li>
            ))}
          </ul>
        )}
        {f.photos.length > 0 && (
          <ul className="mt-2 flex flex-wrap gap-2" aria-label="Teardown photos">
            {f.photos.map((p) => (
              <li key={p.id}>
                <a href={p.url} target="_blank" rel="noreferrer">
                  <img
                    src={p.url}
                    alt={p.fileName}
                    className="h-24 w-32 rounded-control border border-rule-strong object-cover"
                  />
                </a>
              </li>
            ))}
          </ul>
        )}
        <p className="mt-2 text-sm text-ink-soft">
          Recorded by {f.recordedBy} · <span className="font-mono">{formatWhen(f.recordedAt)}</span>
        </p>
      </section>
      <section aria-label={`Finding ${index + 1}: when it was built`} className="flex flex-col gap-2">
        <h4 className="text-sm font-semibold uppercase tracking-wide text-ink-soft">
          {f.subject.kind === 'lot' ? 'The unit’s own stages, where its lots went in' : 'When it was built'}
        </h4>
        {f.built.length === 0 ? (
          <p className="text-ink-soft">Nothing was recorded on it at a station.</p>
        ) : (
          f.built.map((r, i) => <BuiltResultBlock key={`${r.stage.code}-${i}`} r={r} f={f} open={openOf(r)} />)
        )}
      </section>
    </article>
  );
}
