import type { ReactNode } from 'react';
import type { AttributeStudyResult, AppraiserAgreement } from '../../../shared/domain/attribute-study';
import type { AnovaResult } from '../../../shared/domain/gauge-rr-anova';
import type { AverageRangeResult } from '../../../shared/domain/gauge-rr-range';
import type { Band, GrrFigures } from '../../../shared/domain/gauge-study';
import type { Proportion } from '../../../shared/domain/kappa';
import { Badge } from '../../components/ui/badge';
import { Table, TableFrame, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { APPRAISER_NAMES } from './study-grid';

const letter = (i: number) => APPRAISER_NAMES[i] ?? String(i + 1);

/** The study's verdict in a word, a colour and a shape. */
export const BAND_WORDS: Record<Band, string> = {
  acceptable: 'Acceptable',
  conditional: 'May be acceptable',
  unacceptable: 'Not acceptable',
};
const BAND_TONE = { acceptable: 'ok', conditional: 'hold', unacceptable: 'bad' } as const;

export function BandBadge({ band }: { band: Band }) {
  return <Badge tone={BAND_TONE[band]}>{BAND_WORDS[band]}</Badge>;
}

const fix = (v: number | null | undefined, digits: number) => (v === null || v === undefined ? '—' : v.toFixed(digits));
const pct = (v: number | null | undefined) => (v === null || v === undefined ? '—' : `${v.toFixed(1)} %`);

const ROWS: [keyof GrrFigures['sigma'], string, string][] = [
  ['ev', 'EV', 'Repeatability (equipment)'],
  ['av', 'AV', 'Reproducibility (appraisers)'],
  ['interaction', 'INT', 'Appraiser × part'],
  ['grr', 'GRR', 'Gauge R&R'],
  ['pv', 'PV', 'Part variation'],
  ['tv', 'TV', 'Total variation'],
];

/** The acceptance bands the verdict is read by (AIAG MSA 4th ed. guidelines). */
export function BandsLegend() {
  return (
    <p className="text-sm text-ink-soft">
      %GRR under 10 % acceptable; 10–30 % may be acceptable, depending on the use and the cost of the gauge; over 30 %
      not acceptable. The number of distinct categories should be 5 or more. With a tolerance, the study is judged by
      %GRR of the tolerance; without one, by %GRR of total variation and ndc.
    </p>
  );
}

/** EV, AV, GRR, PV and TV with %TV, %contribution and %tolerance; ndc; and the bands each falls in. */
export function GrrTable({ r, title, label }: { r: GrrFigures; title: string; label: string }) {
  const showInteraction = 'table' in r;
  return (
    <section aria-label={label} className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h3 className="text-lg font-semibold">{title}</h3>
        <BandBadge band={r.verdict} />
      </div>
      <TableFrame>
        <Table caption={`${title}: standard deviations and percentages`}>
          <THead>
            <TR>
              <TH>Source</TH>
              <TH align="right">Std. dev.</TH>
              <TH align="right">% of TV</TH>
              <TH align="right">% contribution</TH>
              <TH align="right">% of tolerance</TH>
            </TR>
          </THead>
          <TBody>
            {ROWS.filter(([k]) => k !== 'interaction' || showInteraction).map(([k, short, long]) => (
              <TR key={k}>
                <TD>
                  <span className="font-mono font-semibold">{short}</span> <span className="text-ink-soft">{long}</span>
                </TD>
                <TD mono align="right">
                  {fix(r.sigma[k], 5)}
                </TD>
                <TD mono align="right">
                  {pct(r.percentOfTotal[k])}
                </TD>
                <TD mono align="right">
                  {pct(r.percentContribution[k])}
                </TD>
                <TD mono align="right">
                  {k === 'tv' || !r.percentOfTolerance ? '—' : pct(r.percentOfTolerance[k])}
                </TD>
              </TR>
            ))}
          </TBody>
        </Table>
      </TableFrame>
      <dl className="grid grid-cols-1 gap-2 sm:grid-cols-3">
        <div className="rounded-control border border-rule px-3 py-2">
          <dt className="text-xs font-semibold uppercase tracking-wide text-ink-soft">%GRR of tolerance</dt>
          <dd className="flex flex-wrap items-center gap-2">
            <span className="font-mono text-xl tabular-nums">{pct(r.percentOfTolerance?.grr)}</span>
            {r.bands.tolerance ? <BandBadge band={r.bands.tolerance} /> : <span className="text-sm">no tolerance</span>}
          </dd>
        </div>
        <div className="rounded-control border border-rule px-3 py-2">
          <dt className="text-xs font-semibold uppercase tracking-wide text-ink-soft">%GRR of total variation</dt>
          <dd className="flex flex-wrap items-center gap-2">
            <span className="font-mono text-xl tabular-nums">{pct(r.percentOfTotal.grr)}</span>
            <BandBadge band={r.bands.total} />
          </dd>
        </div>
        <div className="rounded-control border border-rule px-3 py-2">
          <dt className="text-xs font-semibold uppercase tracking-wide text-ink-soft">Distinct categories (ndc)</dt>
          <dd className="flex flex-wrap items-center gap-2">
            <span className="font-mono text-xl tabular-nums">{r.ndc ?? '—'}</span>
            {r.bands.ndcAdequate ? <Badge tone="ok">5 or more</Badge> : <Badge tone="bad">Under 5</Badge>}
          </dd>
        </div>
      </dl>
      <p className="text-xs text-ink-soft">
        {r.edition}; %tolerance uses {r.studySpread}σ{r.tolerance !== null ? ` over a tolerance of ${r.tolerance}` : ''}
        .
      </p>
    </section>
  );
}

export function RangeDetails({ r }: { r: AverageRangeResult }) {
  return (
    <p className="text-sm">
      R̄̄ <span className="font-mono">{fix(r.rBarBar, 4)}</span>, X̄diff{' '}
      <span className="font-mono">{fix(r.xBarDiff, 4)}</span>, Rp{' '}
      <span className="font-mono">{fix(r.partRange, 4)}</span>; K1 {r.constants.k1}, K2 {r.constants.k2}, K3{' '}
      {r.constants.k3}. UCL of the ranges <span className="font-mono">{fix(r.uclR, 4)}</span>
      {r.rangesAboveUcl.length
        ? `: ${r.rangesAboveUcl.map((c) => `appraiser ${letter(c.appraiser)} on part ${c.part + 1}`).join(', ')} above it — repeat those readings before the study is judged.`
        : ': no range above it.'}
    </p>
  );
}

const SOURCE_WORDS: Record<AnovaResult['table'][number]['source'], string> = {
  appraiser: 'Appraisers',
  part: 'Parts',
  interaction: 'Appraiser × part',
  repeatability: 'Repeatability',
  total: 'Total',
};

export function AnovaTable({ r }: { r: AnovaResult }) {
  const table = r.pooledTable ?? r.table;
  return (
    <div className="flex flex-col gap-2">
      <TableFrame>
        <Table caption={r.pooled ? 'ANOVA table, interaction pooled into repeatability' : 'ANOVA table'}>
          <THead>
            <TR>
              <TH>Source</TH>
              <TH align="right">DF</TH>
              <TH align="right">SS</TH>
              <TH align="right">MS</TH>
              <TH align="right">F</TH>
              <TH align="right">p</TH>
            </TR>
          </THead>
          <TBody>
            {table.map((row) => (
              <TR key={row.source}>
                <TD>{SOURCE_WORDS[row.source]}</TD>
                <TD mono align="right">
                  {row.df}
                </TD>
                <TD mono align="right">
                  {fix(row.ss, 4)}
                </TD>
                <TD mono align="right">
                  {fix(row.ms, 4)}
                </TD>
                <TD mono align="right">
                  {fix(row.f, 3)}
                </TD>
                <TD mono align="right">
                  {fix(row.p, 4)}
                </TD>
              </TR>
            ))}
          </TBody>
        </Table>
      </TableFrame>
      <p className="text-sm text-ink-soft">
        Interaction p = {fix(r.interactionP, 4)};{' '}
        {r.pooled
          ? `above ${r.poolAbove}, so it is pooled into repeatability.`
          : `at or below ${r.poolAbove}, so it is kept.`}
      </p>
    </div>
  );
}

const prop = (p: Proportion | null) =>
  p === null || p.percent === null ? '—' : `${p.count}/${p.of} (${p.percent.toFixed(1)} %)`;

/** A count with its share, and the exact 95 % interval under it in small type. */
function Share({ p }: { p: Proportion | null }) {
  return (
    <span className="flex flex-col">
      <span className="whitespace-nowrap">{prop(p)}</span>
      {p?.ci95 && (
        <span className="whitespace-nowrap text-xs text-ink-soft">
          95 % {p.ci95[0].toFixed(1)}–{p.ci95[1].toFixed(1)}
        </span>
      )}
    </span>
  );
}

const kappaBand = (k: number): Band => (k > 0.75 ? 'acceptable' : k >= 0.4 ? 'conditional' : 'unacceptable');

function KappaCell({ k }: { k: number | null | undefined }) {
  if (k === null || k === undefined) return <span>—</span>;
  return (
    <span className="inline-flex flex-wrap items-center gap-x-2 gap-y-1">
      <span className="font-mono">{k.toFixed(3)}</span>
      <BandBadge band={kappaBand(k)} />
    </span>
  );
}

/** Agreement within, between and against the reference; Cohen's and Fleiss' kappa; misses and false alarms. */
export function AttributeFigures({ r }: { r: AttributeStudyResult }) {
  // one row per figure, one column per appraiser: five appraisers still fit a tablet's width
  const lines: [string, (a: AppraiserAgreement) => ReactNode][] = [
    ['Agrees with self', (a) => <Share p={a.within} />],
    ['Kappa within (Fleiss’)', (a) => <KappaCell k={a.withinKappa?.kappa} />],
    ['Agrees with the reference', (a) => <Share p={a.vsReference} />],
    ['Kappa vs the reference (Cohen’s)', (a) => <KappaCell k={a.vsReferenceKappa?.kappa} />],
    ['Effectiveness', (a) => <Share p={a.effectiveness} />],
    ['Misses', (a) => <Share p={a.misses} />],
    ['False alarms', (a) => <Share p={a.falseAlarms} />],
  ];
  return (
    <section aria-label="Attribute agreement figures" className="flex flex-col gap-3">
      <dl className="grid grid-cols-1 gap-2 sm:grid-cols-3">
        <div className="rounded-control border border-rule px-3 py-2">
          <dt className="text-xs font-semibold uppercase tracking-wide text-ink-soft">Fleiss’ kappa, everyone</dt>
          <dd>
            <KappaCell k={r.overallKappa?.kappa} />
          </dd>
        </div>
        <div className="rounded-control border border-rule px-3 py-2">
          <dt className="text-xs font-semibold uppercase tracking-wide text-ink-soft">All appraisers agree</dt>
          <dd className="font-mono">{prop(r.between)}</dd>
        </div>
        <div className="rounded-control border border-rule px-3 py-2">
          <dt className="text-xs font-semibold uppercase tracking-wide text-ink-soft">All agree with the reference</dt>
          <dd className="font-mono">{prop(r.allVsReference)}</dd>
        </div>
      </dl>
      <div className="overflow-x-auto">
        <Table caption="Each appraiser">
          <THead>
            <TR>
              <TH>Figure</TH>
              {r.appraisers.map((a) => (
                <TH key={a.appraiser}>Appraiser {letter(a.appraiser)}</TH>
              ))}
            </TR>
          </THead>
          <TBody>
            {lines.map(([label, cell]) => (
              <TR key={label}>
                <TD>{label}</TD>
                {r.appraisers.map((a) => (
                  <TD key={a.appraiser} mono>
                    {cell(a)}
                  </TD>
                ))}
              </TR>
            ))}
          </TBody>
        </Table>
      </div>
      {r.pairs.length > 0 && (
        <p className="text-sm">
          Cohen’s kappa between appraisers:{' '}
          {r.pairs.map((p) => (
            <span key={`${p.first}-${p.second}`} className="mr-4 inline-flex items-center gap-1">
              {letter(p.first)} and {letter(p.second)}: <KappaCell k={p.kappa?.kappa} />
            </span>
          ))}
        </p>
      )}
      <p className="text-sm text-ink-soft">
        Kappa over 0.75 is good agreement, 0.40–0.75 may be acceptable, under 0.40 is poor. Effectiveness 90 % or more,
        misses 2 % or less and false alarms 5 % or less are acceptable (AIAG MSA 4th ed. guidelines).
      </p>
    </section>
  );
}
