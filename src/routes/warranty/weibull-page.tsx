import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router';
import type { WeibullFitJson, WeibullJson } from '../../../shared/schemas/warranty';
import { familiesQueryOptions } from '../../api/reference/families';
import { useWeibull, weibullQueryOptions } from '../../api/warranty/weibull';
import { PageHeader } from '../../components/page-header';
import { ButtonLink } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { Table, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { formatGrouped } from '../../lib/format';
import { paths } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { useUrlFilter } from '../../lib/use-url-filter';
import { AnalysisFilterBar, analysisFilterOf, withFilter } from './analysis-filter';
import { ChartCard } from './charts/chart-card';
import { percent, WeibullPlot } from './charts/weibull-plot';

export const weibullLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'warranty.analysis');
    await Promise.all([
      queryClient.ensureQueryData(weibullQueryOptions(analysisFilterOf(new URL(request.url).searchParams))),
      queryClient.ensureQueryData(familiesQueryOptions()),
    ]);
    return null;
  };

const months = (v: number) => `${v.toFixed(1)} months`;

/** What the shape says about how the units fail, in the trade's usual reading of β. */
function shapeWords(shape: number) {
  if (shape < 0.95) return 'falling failure rate: early-life failures (build or installation)';
  if (shape <= 1.05) return 'about constant failure rate: failures at random';
  return 'rising failure rate: wear-out';
}

function Parameters({ w }: { w: WeibullJson }) {
  const fits: [string, WeibullFitJson | null][] = [
    ['Median-rank regression', w.regression],
    ['Maximum likelihood', w.mle],
  ];
  return (
    <div className="overflow-x-auto">
      <Table caption="Weibull parameters by method">
        <THead>
          <TR>
            <TH>Method</TH>
            <TH align="right">
              Shape <span className="normal-case">β</span>
            </TH>
            <TH align="right">
              Scale <span className="normal-case">η</span>
            </TH>
            <TH align="right">B10 life</TH>
            <TH align="right">Goodness</TH>
          </TR>
        </THead>
        <TBody>
          {fits.map(([name, f]) => (
            <TR key={name}>
              <TD>
                <span className="font-medium">{name}</span>
                {f && <span className="block text-sm text-ink-soft">{shapeWords(f.shape)}</span>}
              </TD>
              <TD align="right" mono>
                {f ? f.shape.toFixed(3) : '—'}
              </TD>
              <TD align="right" mono nowrap>
                {f ? months(f.scale) : '—'}
              </TD>
              <TD align="right" mono nowrap>
                {f ? months(f.b10) : '—'}
              </TD>
              <TD align="right" mono nowrap>
                {f?.rSquared != null
                  ? `R² ${f.rSquared.toFixed(4)}`
                  : f?.logLikelihood != null
                    ? `ℓ ${f.logLikelihood.toFixed(2).replace('-', '−')}`
                    : '—'}
              </TD>
            </TR>
          ))}
        </TBody>
      </Table>
    </div>
  );
}

function Counts({ w }: { w: WeibullJson }) {
  const facts: [string, string][] = [
    ['Units in service', formatGrouped(w.units)],
    ['Failures', formatGrouped(w.failures)],
    ['Still running (suspensions)', formatGrouped(w.suspensions)],
    ['Shipped today, left out', formatGrouped(w.notInService)],
  ];
  return (
    <dl className="grid grid-cols-2 gap-x-6 gap-y-3 md:grid-cols-4">
      {facts.map(([k, v]) => (
        <div key={k}>
          <dt className="text-xs font-semibold uppercase tracking-wide text-ink-soft">{k}</dt>
          <dd className="font-mono text-2xl tabular-nums">{v}</dd>
        </div>
      ))}
    </dl>
  );
}

export function WeibullPage() {
  const { params } = useUrlFilter();
  const filter = analysisFilterOf(params);
  const weibull = useWeibull(filter);
  const w = weibull.data;
  return (
    <div className="mx-auto max-w-page">
      <PageHeader
        title="Weibull of time to failure"
        description="Months in service to the first failure of each shipped unit. Every unit still running counts as a suspension at its age today, and a unit whose claim found no product failure at the day it came out of service."
        actions={<ButtonLink to={withFilter(paths.warrantyAnalysis, params)}>Claim rates</ButtonLink>}
      />
      <AnalysisFilterBar />
      {w && (
        <div className={`flex flex-col gap-5 transition-opacity ${weibull.isPlaceholderData ? 'opacity-60' : ''}`}>
          <Card labelledBy="weibull-fleet">
            <CardHeader
              id="weibull-fleet"
              title={`The units counted${w.family ? ` · ${w.family}` : ''}`}
              description={`As of ${w.asOf}.`}
            />
            <CardBody>
              <Counts w={w} />
            </CardBody>
          </Card>
          {w.message && (
            <Notice tone="info" live="status">
              {w.message}
            </Notice>
          )}
          <div className="grid grid-cols-1 gap-5 2xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
            <ChartCard
              title="Probability plot"
              description="Failures at Johnson’s adjusted ranks with Bernard’s median-rank approximation, (i − 0.3)/(n + 0.4); a straight line is a Weibull life."
              filename="weibull-points.csv"
              rows={w.points}
              columns={[
                { header: 'Unit', value: (p) => p.serial },
                { header: 'Months in service', value: (p) => p.time.toFixed(2), align: 'right' },
                { header: 'Adjusted rank', value: (p) => p.adjustedRank.toFixed(3), align: 'right' },
                { header: 'Median rank', value: (p) => percent(p.medianRank), align: 'right' },
              ]}
              chart={w.points.length ? <WeibullPlot w={w} /> : <p className="text-ink-soft">No failure to plot yet.</p>}
            />
            <Card labelledBy="weibull-params">
              <CardHeader
                id="weibull-params"
                title="Parameters"
                description="η: the age by which 63.2 % have failed. B10: the age by which 10 % have failed."
              />
              <Parameters w={w} />
              <CardBody>
                {w.failures > 0 && w.failures < 10 && (
                  <p className="mb-2 text-sm font-medium text-ink">
                    Only {w.failures} failure{w.failures === 1 ? '' : 's'}: read the shape loosely; it steadies as more
                    months in service come in.
                  </p>
                )}
                <p className="text-sm text-ink-soft">
                  Regression puts X on Y through the plotted points; maximum likelihood uses every failure and
                  suspension directly and is the better guide when failures are few. Where the two differ widely, read
                  the plot before either figure.
                </p>
              </CardBody>
            </Card>
          </div>
        </div>
      )}
    </div>
  );
}
