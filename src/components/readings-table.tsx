import type { RecordedReading } from '../../shared/schemas/results';
import type { Verdict } from '../../shared/domain/tolerance';
import { sharedDecimals } from '../lib/format';
import { Badge } from './ui/badge';
import { Icon } from './ui/icon';
import { Table, TBody, TD, TH, THead } from './ui/table';

/**
 * What a readings table needs of a reading: a stored one (the trail), or one as the station
 * judged it (an item's results), whose verdict is null while a reading it needs is missing.
 */
export type ShownReading = Pick<
  RecordedReading,
  | 'characteristic'
  | 'name'
  | 'position'
  | 'positionLabel'
  | 'value'
  | 'passed'
  | 'unit'
  | 'entered'
  | 'ruleVersion'
  | 'lower'
  | 'upper'
  | 'location'
> & { verdict: Verdict | null; kind?: RecordedReading['kind'] };

const checked = (r: ShownReading) => r.kind === 'attribute' || (r.value === null && r.passed !== null);

const num = (v: number, d: number) =>
  v
    .toLocaleString('en-US', { minimumFractionDigits: d, maximumFractionDigits: d, useGrouping: false })
    .replace('-', '−');

/** Per characteristic, the decimals that show its values (and limits) exactly, so a column lines up on the point. */
function decimalsOf(readings: ShownReading[], limits: boolean): Map<string, number> {
  const values = new Map<string, number[]>();
  for (const r of readings) {
    const vs = values.get(r.characteristic) ?? [];
    for (const v of limits ? [r.value, r.lower, r.upper] : [r.value]) if (v !== null) vs.push(v);
    values.set(r.characteristic, vs);
  }
  return new Map([...values].map(([k, vs]) => [k, sharedDecimals(vs, 0, 6)]));
}

/** A reading's value as shown: in its unit with `decimals` places (by default as many as it has), or Pass/Fail. */
export function valueText(r: ShownReading, d = sharedDecimals(r.value === null ? [] : [r.value], 0, 6)): string {
  if (r.kind === 'attribute' || r.value === null) return r.passed === null ? '—' : r.passed ? 'Pass' : 'Fail';
  const shown = r.unit ? `${num(r.value, d)} ${r.unit}` : num(r.value, d);
  // typed in another unit: what was typed stays beside the judged value
  return r.entered ? `${shown} (typed ${String(r.entered.value).replace('-', '−')} ${r.entered.unit})` : shown;
}

function limitsText(r: ShownReading, d: number): string {
  const unit = r.unit ? ` ${r.unit}` : '';
  if (r.lower !== null && r.upper !== null) return `${num(r.lower, d)} – ${num(r.upper, d)}${unit}`;
  if (r.lower !== null) return `at least ${num(r.lower, d)}${unit}`;
  if (r.upper !== null) return `at most ${num(r.upper, d)}${unit}`;
  return checked(r) ? 'Pass required' : '—';
}

function VerdictWord({ r }: { r: ShownReading }) {
  if (r.verdict === null) return <Badge tone="off">Not judged</Badge>;
  if (r.verdict === 'pass') return <Badge tone="ok">{checked(r) ? 'Passed' : 'In tolerance'}</Badge>;
  return <Badge tone="bad">{checked(r) ? 'Failed' : 'Out of tolerance'}</Badge>;
}

type ReadingsTableProps = {
  readings: ShownReading[];
  caption: string;
  /** Show the limits each reading was judged against (the trail does; an item's history leaves them to the trail). */
  limits?: boolean;
};

/** The readings of one result, each with its verdict and the rule version it was judged by. */
export function ReadingsTable({ readings, caption, limits = false }: ReadingsTableProps) {
  const decimals = decimalsOf(readings, limits);
  return (
    <div className="rounded-control border border-rule bg-card">
      <Table caption={caption}>
        <THead>
          <tr>
            <TH>Characteristic</TH>
            <TH>Position</TH>
            <TH align="right">Value</TH>
            {limits && <TH align="right">Limits</TH>}
            <TH>Verdict</TH>
            <TH>Rule version</TH>
          </tr>
        </THead>
        <TBody>
          {readings.map((r, i) => {
            const d = decimals.get(r.characteristic) ?? 0;
            const failed = r.verdict === 'fail';
            return (
              <tr key={`${r.characteristic}/${r.position}/${i}`} className={failed ? 'bg-bad-tint font-medium' : ''}>
                <TD>
                  <span className="inline-flex items-center gap-1.5">
                    {failed && <Icon name="bad" size={16} className="shrink-0 text-bad" />}
                    {r.name}
                  </span>
                </TD>
                <TD>
                  {r.positionLabel}
                  {r.location && <span className="block text-sm text-ink-soft">{r.location}</span>}
                </TD>
                <TD align="right" mono nowrap>
                  {valueText(r, d)}
                </TD>
                {limits && (
                  <TD align="right" mono nowrap>
                    {limitsText(r, d)}
                  </TD>
                )}
                <TD nowrap>
                  <VerdictWord r={r} />
                </TD>
                <TD mono nowrap>
                  {r.ruleVersion === null ? '—' : `v${r.ruleVersion}`}
                </TD>
              </tr>
            );
          })}
        </TBody>
      </Table>
    </div>
  );
}
