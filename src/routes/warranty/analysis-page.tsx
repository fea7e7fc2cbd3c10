import type { QueryClient } from '@tanstack/react-query';
import { Link, type LoaderFunctionArgs } from 'react-router';
import {
  RATE_DIMENSION_LABELS,
  RATE_DIMENSIONS,
  type AnalysisJson,
  type RateDimension,
  type RateRow,
} from '../../../shared/schemas/warranty';
import { useSignedIn } from '../../api/auth/me';
import { familiesQueryOptions } from '../../api/reference/families';
import { analysisCsvHref, analysisQueryOptions, useAnalysis } from '../../api/warranty/analysis';
import { PageHeader } from '../../components/page-header';
import { buttonClass, ButtonLink } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { EmptyRow, Table, TableFrame, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { formatGrouped } from '../../lib/format';
import { paths } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { useUrlFilter } from '../../lib/use-url-filter';
import { AnalysisFilterBar, analysisFilterOf, withFilter } from './analysis-filter';
import { MonthsInServiceChart } from './charts/months-in-service';

export const analysisLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'warranty.analysis');
    await Promise.all([
      queryClient.ensureQueryData(analysisQueryOptions(analysisFilterOf(new URL(request.url).searchParams))),
      queryClient.ensureQueryData(familiesQueryOptions()),
    ]);
    return null;
  };

const rate = (n: number) => n.toFixed(2);

/** Whose rate a dimension is: the unit's own, or the parts its teardown findings named. */
const BY_PARTS = new Set<RateDimension>(['station', 'gauge', 'operator']);

function Fleet({ a }: { a: AnalysisJson }) {
  const per100 = (n: number) => (a.fleet.units ? rate((100 * n) / a.fleet.units) : '—');
  const facts: [string, string][] = [
    ['Units shipped', formatGrouped(a.fleet.units)],
    ['Claims', formatGrouped(a.fleet.claims)],
    ['Failures', formatGrouped(a.fleet.failures)],
    ['Claims per 100 units', per100(a.fleet.claims)],
    ['Failures per 100 units', per100(a.fleet.failures)],
  ];
  return (
    <dl className="grid grid-cols-2 gap-x-6 gap-y-3 sm:grid-cols-5">
      {facts.map(([k, v]) => (
        <div key={k}>
          <dt className="text-xs font-semibold uppercase tracking-wide text-ink-soft">{k}</dt>
          <dd className="font-mono text-2xl tabular-nums">{v}</dd>
        </div>
      ))}
    </dl>
  );
}

/** A failure rate as a number and a bar against the worst group, so the eye finds the outlier. */
function RateBar({ value, max }: { value: number; max: number }) {
  const width = max > 0 ? Math.min(100, Math.max((100 * value) / max, value > 0 ? 2 : 0)) : 0;
  return (
    <span className="flex items-center justify-end gap-2">
      <span className="font-mono tabular-nums">{rate(value)}</span>
      <span aria-hidden className="hidden h-3 w-28 rounded-sm border border-rule-strong bg-sunk md:block">
        <span className="block h-full rounded-sm bg-accent" style={{ width: `${width}%` }} />
      </span>
    </span>
  );
}

/**
 * Groups with fewer units than this are listed after the others and marked: one claim among four
 * units is a rate of 25 per 100 and says little (common practice: read small groups as counts).
 */
const FEW_UNITS = 5;

function RatesTable({ by, rows: all }: { by: RateDimension; rows: RateRow[] }) {
  const rows = [...all.filter((r) => r.units >= FEW_UNITS), ...all.filter((r) => r.units < FEW_UNITS)];
  const sized = rows.filter((r) => r.units >= FEW_UNITS);
  const max = Math.max(0, ...(sized.length ? sized : rows).map((r) => r.failureRate));
  return (
    <TableFrame label={`Claim rates by ${RATE_DIMENSION_LABELS[by].toLowerCase()}`}>
      <Table caption={`Claim and failure rates by ${RATE_DIMENSION_LABELS[by].toLowerCase()}`}>
        <THead>
          <TR>
            <TH>{RATE_DIMENSION_LABELS[by]}</TH>
            <TH align="right">Units shipped</TH>
            <TH align="right">Claims</TH>
            <TH align="right">Failures</TH>
            <TH align="right">Claims / 100</TH>
            <TH align="right">Failures / 100</TH>
          </TR>
        </THead>
        <TBody>
          {rows.length ? (
            rows.map((r) => (
              <TR key={r.key} muted={r.units < FEW_UNITS}>
                <TD>
                  {r.label}
                  {r.units < FEW_UNITS && (
                    <span className="ml-2 whitespace-nowrap text-sm">(fewer than {FEW_UNITS} units)</span>
                  )}
                </TD>
                <TD align="right" mono>
                  {formatGrouped(r.units)}
                </TD>
                <TD align="right" mono>
                  {formatGrouped(r.claims)}
                </TD>
                <TD align="right" mono>
                  {formatGrouped(r.failures)}
                </TD>
                <TD align="right" mono>
                  {rate(r.claimRate)}
                </TD>
                <TD align="right">
                  <RateBar value={r.failureRate} max={max} />
                </TD>
              </TR>
            ))
          ) : (
            <EmptyRow colSpan={6}>No shipped units in this range.</EmptyRow>
          )}
        </TBody>
      </Table>
    </TableFrame>
  );
}

export function AnalysisPage() {
  const me = useSignedIn();
  const { params, setMany } = useUrlFilter();
  const filter = analysisFilterOf(params);
  const analysis = useAnalysis(filter);
  const by = (RATE_DIMENSIONS as readonly string[]).includes(params.get('by') ?? '')
    ? (params.get('by') as RateDimension)
    : 'family';
  const a = analysis.data;
  return (
    <div className="mx-auto max-w-page">
      <PageHeader
        title="Warranty analysis"
        description="Claims against every unit shipped: rates by what the units share, and when in their life they failed. A claim counts as a failure once its teardown names a cause that counts as one."
        actions={
          <>
            <ButtonLink to={withFilter(paths.weibull, params)} variant="primary" icon="arrowRight">
              Weibull of time to failure
            </ButtonLink>
            <a href={analysisCsvHref(filter)} download className={buttonClass('secondary', 'md')}>
              <Icon name="download" size={18} />
              Export every rate (CSV)
            </a>
          </>
        }
      />
      <AnalysisFilterBar />
      {a && (
        <div className={`flex flex-col gap-5 transition-opacity ${analysis.isPlaceholderData ? 'opacity-60' : ''}`}>
          <Card labelledBy="fleet-heading">
            <CardHeader
              id="fleet-heading"
              title={`The fleet${a.family ? ` · ${a.family}` : ''}`}
              description={`Every unit shipped${filter.from ? ` from ${filter.from}` : ''}${filter.to ? ` to ${filter.to}` : ''}, as of ${a.asOf}.`}
            />
            <CardBody>
              <Fleet a={a} />
            </CardBody>
          </Card>
          <Card labelledBy="rates-heading">
            <CardHeader
              id="rates-heading"
              title="Claim rates"
              description={
                BY_PARTS.has(by)
                  ? 'Units shipped with a part recorded there (or by them), and the claims whose teardown named such a part. A claim not yet torn down counts in none of these.'
                  : `Units shipped in each group and the claims on them; the worst failure rate first, groups of fewer than ${FEW_UNITS} units last.`
              }
            />
            <CardBody>
              <div role="group" aria-label="Rates by" className="mb-3 flex flex-wrap gap-2">
                {RATE_DIMENSIONS.map((d) => (
                  <button
                    key={d}
                    type="button"
                    aria-pressed={by === d}
                    onClick={() => setMany({ by: d === 'family' ? '' : d })}
                    className={`min-h-11 floor:min-h-12 rounded-control border px-3 text-sm font-medium ${by === d ? 'border-accent bg-accent text-white' : 'border-rule-strong bg-card text-ink hover:border-accent'}`}
                  >
                    {RATE_DIMENSION_LABELS[d]}
                  </button>
                ))}
              </div>
            </CardBody>
            <RatesTable by={by} rows={a.rates[by]} />
          </Card>
          <MonthsInServiceChart rows={a.monthsInService} />
          <p className="text-sm text-ink-soft">
            Claims themselves are on the{' '}
            <Link to={paths.warrantyClaims} className="text-accent underline">
              claim list
            </Link>
            ;{' '}
            {me?.can('cause-codes.manage') ? (
              <Link to={paths.causeCodes} className="text-accent underline">
                cause codes
              </Link>
            ) : (
              'cause codes'
            )}{' '}
            and whether each counts as a failure are kept by quality.
          </p>
        </div>
      )}
    </div>
  );
}
