import type { SpcChartJson } from '../../../shared/schemas/spc';
import { CHART_METHOD_LABELS } from '../../../shared/schemas/spc';
import { Badge } from '../../components/ui/badge';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { EmptyRow, Table, TableFrame, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { formatWhen, plural } from '../../lib/format';
import { ControlChart } from './control-chart';
import { CsvButton, NumbersPanel } from './numbers-panel';
import { fixed } from './numbers';

const fileStem = (c: SpcChartJson) =>
  `${c.family.code}-${c.characteristic.code}-${c.period.from.slice(0, 10)}-${c.period.to.slice(0, 10)}`;

/** Every chart of the method with its numbers, then the run-rule signals they show. */
export function ChartsCard({ chart, digits }: { chart: SpcChartJson; digits: number }) {
  const unit = chart.characteristic.unit;
  const u = unit ? ` (${unit})` : '';
  const method = CHART_METHOD_LABELS[chart.method];
  return (
    <>
      <Card labelledBy="charts-heading">
        <CardHeader
          id="charts-heading"
          title={`${method} chart`}
          description={`${plural(chart.points.length, 'point')}, each ${
            chart.method === 'part-means' || (chart.method !== 'i-mr' && chart.subgroupSize > 1)
              ? `${chart.subgroupSize} readings`
              : 'one reading'
          }, in the order they were recorded.${chart.baseline && (chart.baseline.from > 0 || chart.baseline.to < chart.points.length - 1) ? ' The shaded band is the baseline the limits come from.' : ''}`}
          actions={
            chart.signals.length ? (
              <Badge tone="bad">{plural(chart.signals.length, 'signal')}</Badge>
            ) : chart.charts.length ? (
              <Badge tone="ok">No signals</Badge>
            ) : null
          }
        />
        <CardBody>
          <div className="flex flex-col gap-6">
            {chart.charts.map((line) => {
              const signals = chart.signals.filter((s) => s.chart === line.kind);
              return (
                <section key={line.kind} aria-label={line.label} className="flex flex-col gap-2">
                  <h3 className="flex flex-wrap items-center gap-2 font-semibold">
                    {line.label}
                    {u && <span className="font-normal text-ink-soft">{u}</span>}
                    {signals.length > 0 && <Badge tone="bad">{plural(signals.length, 'signal')}</Badge>}
                  </h3>
                  <ControlChart
                    line={line}
                    points={chart.points}
                    signals={signals}
                    baseline={chart.baseline}
                    digits={line.kind === 'part-mean' || line.kind === 'xbar' ? digits + 1 : digits + 1}
                    unit={unit}
                  />
                  <NumbersPanel
                    title={`${line.label}: the numbers`}
                    filename={`${fileStem(chart)}-${line.kind}.csv`}
                    rows={line.values.map((v, i) => ({ v, i }))}
                    columns={[
                      { header: 'Point', text: (r) => String(r.i + 1), align: 'right' },
                      { header: 'Serial', text: (r) => chart.points[r.i]!.serial, mono: true },
                      {
                        header: 'Recorded',
                        text: (r) => formatWhen(chart.points[r.i]!.at),
                        csv: (r) => chart.points[r.i]!.at,
                        mono: true,
                      },
                      { header: 'Station', text: (r) => chart.points[r.i]!.station ?? '—', mono: true },
                      {
                        header: `Value${u}`,
                        text: (r) => fixed(r.v, digits + 1),
                        csv: (r) => r.v,
                        align: 'right',
                        mono: true,
                      },
                      {
                        header: 'Lower limit',
                        text: () => fixed(line.lower, digits + 1),
                        csv: () => line.lower,
                        align: 'right',
                        mono: true,
                      },
                      {
                        header: 'Centre',
                        text: () => fixed(line.centre, digits + 1),
                        csv: () => line.centre,
                        align: 'right',
                        mono: true,
                      },
                      {
                        header: 'Upper limit',
                        text: () => fixed(line.upper, digits + 1),
                        csv: () => line.upper,
                        align: 'right',
                        mono: true,
                      },
                      {
                        header: 'Baseline',
                        text: (r) =>
                          chart.baseline && r.i >= chart.baseline.from && r.i <= chart.baseline.to ? 'yes' : 'no',
                      },
                      {
                        header: 'Signal',
                        text: (r) =>
                          signals
                            .filter((s) => s.index === r.i)
                            .map((s) => `rule ${s.rule}`)
                            .join(', ') || '—',
                      },
                    ]}
                  />
                </section>
              );
            })}
          </div>
        </CardBody>
      </Card>
      <Card labelledBy="signals-heading">
        <CardHeader
          id="signals-heading"
          title="Signals on these charts"
          description="Western Electric run rules: a point beyond a limit (1), two of three beyond 2σ (2), four of five beyond 1σ (3), eight in a row on one side (4). Spread charts are checked against rule 1 only."
        />
        <TableFrame label="Signals on these charts">
          <Table caption="Signals on these charts">
            <THead>
              <tr>
                <TH align="right">Point</TH>
                <TH>Serial</TH>
                <TH>Recorded</TH>
                <TH>Chart</TH>
                <TH>Rule</TH>
                <TH align="right">Value{u}</TH>
              </tr>
            </THead>
            <TBody>
              {chart.signals.length === 0 && (
                <EmptyRow colSpan={6}>No run rule is broken on these charts in this period.</EmptyRow>
              )}
              {chart.signals.map((s) => (
                <TR key={`${s.chart}-${s.index}-${s.rule}`}>
                  <TD align="right" mono>
                    {s.index + 1}
                  </TD>
                  <TD mono>{s.serial}</TD>
                  <TD mono nowrap>
                    {formatWhen(s.at)}
                  </TD>
                  <TD>{chart.charts.find((c) => c.kind === s.chart)?.label ?? s.chart}</TD>
                  <TD>
                    <span className="flex items-center gap-2">
                      <Badge tone="bad" icon={null}>
                        ◆ Rule {s.rule}
                      </Badge>
                      <span className="text-sm">{s.text}</span>
                    </span>
                  </TD>
                  <TD align="right" mono>
                    {fixed(s.value, digits + 1)}
                  </TD>
                </TR>
              ))}
            </TBody>
          </Table>
        </TableFrame>
        <CardBody>
          <div data-density="floor" className="flex items-center gap-3">
            <CsvButton
              filename={`${fileStem(chart)}-signals.csv`}
              rows={chart.signals}
              columns={[
                { header: 'Point', text: (s) => String(s.index + 1) },
                { header: 'Serial', text: (s) => s.serial },
                { header: 'Recorded', text: (s) => s.at },
                { header: 'Chart', text: (s) => s.chart },
                { header: 'Rule', text: (s) => String(s.rule) },
                { header: 'What it means', text: (s) => s.text },
                { header: 'Value', text: (s) => String(s.value) },
              ]}
            />
            <span className="text-sm text-ink-soft">{plural(chart.signals.length, 'signal')}</span>
          </div>
        </CardBody>
      </Card>
    </>
  );
}
