import type { TrailReading, TrailResult } from '../../../shared/schemas/build';
import { Badge } from '../../components/ui/badge';
import { Icon } from '../../components/ui/icon';
import { Table, TBody, TD, TH, THead } from '../../components/ui/table';
import { sharedDecimals } from '../../lib/format';

const checked = (r: TrailReading) => r.value === null && r.passed !== null;

const num = (v: number, d: number) =>
  v
    .toLocaleString('en-US', { minimumFractionDigits: d, maximumFractionDigits: d, useGrouping: false })
    .replace('-', '−');

/** Per characteristic, the decimals that show its values and limits exactly, so a column lines up on the point. */
function decimalsOf(readings: TrailReading[]): Map<string, number> {
  const values = new Map<string, number[]>();
  for (const r of readings) {
    const vs = values.get(r.characteristic) ?? [];
    for (const v of [r.value, r.lower, r.upper]) if (v !== null) vs.push(v);
    values.set(r.characteristic, vs);
  }
  return new Map([...values].map(([k, vs]) => [k, sharedDecimals(vs, 0, 6)]));
}

function valueText(r: TrailReading, d: number): string {
  if (r.value === null) return r.passed === null ? '—' : r.passed ? 'Pass' : 'Fail';
  return r.unit ? `${num(r.value, d)} ${r.unit}` : num(r.value, d);
}

function limitsText(r: TrailReading, d: number): string {
  const unit = r.unit ? ` ${r.unit}` : '';
  if (r.lower !== null && r.upper !== null) return `${num(r.lower, d)} – ${num(r.upper, d)}${unit}`;
  if (r.lower !== null) return `at least ${num(r.lower, d)}${unit}`;
  if (r.upper !== null) return `at most ${num(r.upper, d)}${unit}`;
  return checked(r) ? 'Pass required' : '—';
}

function Verdict({ r }: { r: TrailReading }) {
  if (r.verdict === 'pass') return <Badge tone="ok">{checked(r) ? 'Passed' : 'In tolerance'}</Badge>;
  return <Badge tone="bad">{checked(r) ? 'Failed' : 'Out of tolerance'}</Badge>;
}

/** The readings of one result, each with the limits and rule version it was judged by. */
export function ReadingsTable({ result }: { result: TrailResult }) {
  const decimals = decimalsOf(result.readings);
  return (
    <div className="rounded-control border border-rule bg-card">
      <Table caption={`Readings of result ${result.id}: ${result.stage.name}, ${result.serial}`}>
        <THead>
          <tr>
            <TH>Characteristic</TH>
            <TH>Position</TH>
            <TH align="right">Value</TH>
            <TH align="right">Limits</TH>
            <TH>Verdict</TH>
            <TH>Rule version</TH>
          </tr>
        </THead>
        <TBody>
          {result.readings.map((r, i) => {
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
                <TD align="right" mono nowrap>
                  {limitsText(r, d)}
                </TD>
                <TD nowrap>
                  <Verdict r={r} />
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
