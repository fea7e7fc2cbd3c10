import type { Indices } from '../../../shared/domain/spc/capability';
import type { SpcCapabilityJson, SpcChartJson } from '../../../shared/schemas/spc';
import { Badge } from '../../components/ui/badge';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { EmptyRow, Table, TableFrame, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { plural } from '../../lib/format';
import { HistogramChart } from './histogram-chart';
import { CsvButton, NumbersPanel } from './numbers-panel';
import { fixed, index2 } from './numbers';

/** Cpk against the usual thresholds (AIAG SPC manual, common practice): 1.33 capable, 1.00 marginal. */
function cpkTone(v: number | null | undefined): { tone: 'ok' | 'hold' | 'bad'; word: string } {
  if (v === null || v === undefined) return { tone: 'hold', word: 'Not worked out' };
  if (v >= 1.33) return { tone: 'ok', word: 'Capable (1.33 or more)' };
  if (v >= 1) return { tone: 'hold', word: 'Marginal (1.00 to 1.33)' };
  return { tone: 'bad', word: 'Not capable (under 1.00)' };
}

function Figure({ label, value, note }: { label: string; value: string; note?: string }) {
  return (
    <div className="flex flex-col rounded-control border border-rule bg-sunk px-3 py-2">
      <dt className="text-sm text-ink-soft">{label}</dt>
      <dd className="font-mono text-xl font-semibold tabular-nums">{value}</dd>
      {note && <dd className="font-mono text-xs text-ink-soft">{note}</dd>}
    </div>
  );
}

const interval = (i: Indices | null | undefined) =>
  i
    ? `${Math.round(i.interval.confidence * 100)} %: ${index2(i.interval.lower)} to ${index2(i.interval.upper)}`
    : undefined;

export function CapabilityCard({
  chart,
  byGroup,
  digits,
}: {
  chart: SpcChartJson;
  byGroup: SpcCapabilityJson | undefined;
  digits: number;
}) {
  const cap = chart.capability;
  const unit = chart.characteristic.unit;
  const u = unit ? ` ${unit}` : '';
  const n = chart.normality;
  const verdict = cpkTone(cap?.within?.index ?? cap?.overall?.index);
  const stem = `${chart.family.code}-${chart.characteristic.code}-${chart.period.from.slice(0, 10)}`;
  return (
    <Card labelledBy="capability-heading">
      <CardHeader
        id="capability-heading"
        title="Capability"
        description={
          chart.spec
            ? `Against version ${chart.spec.ruleVersion} in force: ${fixed(chart.spec.lower, digits)} to ${fixed(chart.spec.upper, digits)}${u}. Cp and Cpk from the σ within the chart (short term); Pp and Ppk from every reading.`
            : 'No rule is in force, so there is no tolerance to compare with.'
        }
        actions={cap && <Badge tone={verdict.tone}>{verdict.word}</Badge>}
      />
      <CardBody>
        <div className="flex flex-col gap-4">
          {cap && (
            <dl className="grid grid-cols-2 gap-2 sm:grid-cols-3 lg:grid-cols-6">
              <Figure label="Cp" value={index2(cap.within?.potential)} />
              <Figure label="Cpk" value={index2(cap.within?.index)} note={interval(cap.within)} />
              <Figure label="Pp" value={index2(cap.overall?.potential)} />
              <Figure label="Ppk" value={index2(cap.overall?.index)} note={interval(cap.overall)} />
              <Figure label={`Mean${u}`} value={fixed(cap.mean, digits + 1)} note={`${plural(cap.n, 'reading')}`} />
              <Figure
                label="Expected outside"
                value={cap.within ? `${fixed(cap.within.ppm.total, 1)} ppm` : '—'}
                note="if the process is normal"
              />
            </dl>
          )}
          {n &&
            (n.checked ? (
              n.normal ? (
                <Notice tone="ok">
                  Normality (Anderson–Darling): no reason to doubt a normal distribution (p = {n.pValue.toPrecision(2)},
                  A*² = {n.a2Adjusted.toFixed(3)}). The expected ppm above can be read as they are.
                </Notice>
              ) : (
                <Notice tone="hold" title="The readings fail a normality check">
                  Anderson–Darling A*² = {n.a2Adjusted.toFixed(2)}, p{' '}
                  {n.pValue < 0.0001 ? '< 0.0001' : `= ${n.pValue.toPrecision(2)}`} with {plural(n.n, 'reading')}. Cpk,
                  Ppk and the expected ppm assume a normal process: read them as a guide, and look at the histogram.
                </Notice>
              )
            ) : (
              <Notice tone="info">Normality not checked: {n.reason}.</Notice>
            ))}
          {chart.histogram && (
            <section aria-label="Histogram against the limits" className="flex flex-col gap-2">
              <h3 className="font-semibold">Histogram against the limits</h3>
              <HistogramChart
                histogram={chart.histogram}
                limits={chart.spec}
                digits={digits}
                unit={unit}
                mean={cap?.mean ?? null}
                sigma={cap?.overall?.sigma ?? null}
              />
              <p className="text-sm text-ink-soft">
                Solid bars are inside the tolerance; red hatched bars are outside it. The dashed curve is a normal
                distribution with the readings’ mean and σ.
              </p>
              <NumbersPanel
                title="Histogram: the numbers"
                filename={`${stem}-histogram.csv`}
                rows={chart.histogram.bins}
                columns={[
                  {
                    header: `From${u}`,
                    text: (b) => fixed(b.lower, digits + 1),
                    csv: (b) => b.lower,
                    align: 'right',
                    mono: true,
                  },
                  {
                    header: `To${u}`,
                    text: (b) => fixed(b.upper, digits + 1),
                    csv: (b) => b.upper,
                    align: 'right',
                    mono: true,
                  },
                  { header: 'Readings', text: (b) => String(b.count), align: 'right', mono: true },
                  {
                    header: 'Where',
                    text: (b) => (b.zone === 'within' ? 'inside the tolerance' : `outside (${b.zone})`),
                  },
                ]}
              />
            </section>
          )}
        </div>
      </CardBody>
      {byGroup && (
        <section aria-labelledby="groups-heading" className="border-t border-rule">
          <h3 id="groups-heading" className="px-5 pb-1 pt-3 font-semibold">
            By station and gauge
          </h3>
          <p className="px-5 pb-2 text-sm text-ink-soft">
            The same period, all results first, then each station and gauge on its own: a gauge or a machine that reads
            differently shows here.
          </p>
          <TableFrame label="Capability by station and gauge">
            <Table caption="Capability by station and gauge">
              <THead>
                <tr>
                  <TH>Station</TH>
                  <TH>Gauge</TH>
                  <TH align="right">Parts</TH>
                  <TH align="right">Mean{u}</TH>
                  <TH align="right">Cp</TH>
                  <TH align="right">Cpk</TH>
                  <TH align="right">Cpk 95 %</TH>
                  <TH align="right">Ppk</TH>
                  <TH>Normal?</TH>
                </tr>
              </THead>
              <TBody>
                {byGroup.rows.length === 0 && <EmptyRow colSpan={9}>No readings in this period.</EmptyRow>}
                {byGroup.rows.map((r, i) => (
                  <TR key={`${r.station}-${r.gauge}-${i}`}>
                    <TD mono>{i === 0 ? (r.station ?? 'All') : (r.station ?? '—')}</TD>
                    <TD mono>{i === 0 ? (r.gauge ?? 'All') : (r.gauge ?? '—')}</TD>
                    <TD align="right" mono>
                      {r.parts}
                    </TD>
                    <TD align="right" mono>
                      {fixed(r.mean, digits + 1)}
                    </TD>
                    <TD align="right" mono>
                      {index2(r.cp)}
                    </TD>
                    <TD align="right" mono>
                      {index2(r.cpk)}
                    </TD>
                    <TD align="right" mono nowrap>
                      {r.cpkLower === null ? '—' : `${index2(r.cpkLower)} – ${index2(r.cpkUpper)}`}
                    </TD>
                    <TD align="right" mono>
                      {index2(r.ppk)}
                    </TD>
                    <TD>
                      {r.normal === null ? (
                        <span className="text-sm text-ink-soft">{r.note ?? '—'}</span>
                      ) : r.normal ? (
                        <Badge tone="ok">Yes</Badge>
                      ) : (
                        <Badge tone="hold">No</Badge>
                      )}
                    </TD>
                  </TR>
                ))}
              </TBody>
            </Table>
          </TableFrame>
          <div data-density="floor" className="px-5 py-3">
            <CsvButton
              filename={`${stem}-capability.csv`}
              rows={byGroup.rows}
              columns={[
                { header: 'Station', text: (r) => r.station ?? '' },
                { header: 'Gauge', text: (r) => r.gauge ?? '' },
                { header: 'Parts', text: (r) => String(r.parts) },
                { header: 'Readings', text: (r) => String(r.readings) },
                { header: 'Mean', text: (r) => String(r.mean ?? '') },
                { header: 'Sigma within', text: (r) => String(r.sigmaWithin ?? '') },
                { header: 'Cp', text: (r) => String(r.cp ?? '') },
                { header: 'Cpk', text: (r) => String(r.cpk ?? '') },
                { header: 'Cpk lower 95%', text: (r) => String(r.cpkLower ?? '') },
                { header: 'Cpk upper 95%', text: (r) => String(r.cpkUpper ?? '') },
                { header: 'Pp', text: (r) => String(r.pp ?? '') },
                { header: 'Ppk', text: (r) => String(r.ppk ?? '') },
                { header: 'Normality p', text: (r) => String(r.pValue ?? '') },
              ]}
            />
          </div>
        </section>
      )}
    </Card>
  );
}
