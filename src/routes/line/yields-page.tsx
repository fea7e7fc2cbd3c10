import type { QueryClient } from '@tanstack/react-query';
import { redirect, type LoaderFunctionArgs } from 'react-router';
import { fpy } from '../../../shared/domain/yields';
import { PARETO_BY, type ParetoQuery, type YieldQuery } from '../../../shared/schemas/line';
import { csvHref, paretoQueryOptions, usePareto, useYields, yieldsQueryOptions } from '../../api/line/line';
import { familiesQueryOptions, useFamilies } from '../../api/reference/families';
import { FilterInput, FilterSelect } from '../../components/filter-fields';
import { DataAge } from '../../components/data-age';
import { PageHeader } from '../../components/page-header';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import { Table, TableFrame, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { paths } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { useUrlFilter } from '../../lib/use-url-filter';
import { BarChart, ChartNumbers } from './bar-chart';
import { percent } from './words';

const isoDay = (d: Date) => d.toISOString().slice(0, 10);

function filterFrom(p: URLSearchParams, familyId: (code: string) => number | undefined) {
  const by = (PARETO_BY as readonly string[]).includes(p.get('by') ?? '')
    ? (p.get('by') as ParetoQuery['by'])
    : 'defect';
  const grain: ParetoQuery['grain'] = p.get('grain') === 'week' ? 'week' : 'month';
  const y: YieldQuery = {
    from: p.get('from') ?? '',
    to: p.get('to') ?? '',
    family: p.get('family') ? familyId(p.get('family')!) : undefined,
  };
  return { y, pareto: { ...y, by, grain } as ParetoQuery };
}

export const yieldsLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'yields.read');
    const url = new URL(request.url);
    if (!url.searchParams.get('from') || !url.searchParams.get('to')) {
      // a year up to today unless the address says otherwise, so a copied link shows the same numbers
      const to = new Date();
      const from = new Date(to.getTime() - 364 * 86_400_000);
      const next = new URLSearchParams(url.searchParams);
      if (!next.get('from')) next.set('from', isoDay(from));
      if (!next.get('to')) next.set('to', isoDay(to));
      throw redirect(`${paths.yields}?${next}`);
    }
    const families = await queryClient.ensureQueryData(familiesQueryOptions());
    const { y, pareto } = filterFrom(url.searchParams, (c) => families.find((f) => f.code === c)?.id);
    await Promise.allSettled([
      queryClient.ensureQueryData(yieldsQueryOptions(y)),
      queryClient.ensureQueryData(paretoQueryOptions(pareto)),
    ]);
    return null;
  };

const BY_WORDS = { defect: 'Defect code', stage: 'Stage', family: 'Family' };

function CsvLink({ href, children }: { href: string; children: string }) {
  return (
    <a href={href} className="inline-flex min-h-11 floor:min-h-12 items-center gap-1.5 text-accent underline" download>
      <Icon name="download" size={16} />
      {children}
    </a>
  );
}

export function YieldsPage() {
  const { params, set } = useUrlFilter();
  const families = useFamilies().data ?? [];
  const { y, pareto } = filterFrom(params, (c) => families.find((f) => f.code === c)?.id);
  const yields = useYields(y);
  const p = usePareto(pareto);
  const data = yields.data;
  const error = yields.error ?? p.error;
  return (
    <>
      <PageHeader
        title="Yields and losses"
        description="First-pass yield per stage and station, rolled throughput yield per family, scrap and rework, salvage of cores, and the NCR Pareto, over a period of plant days."
      />
      <div className="mb-4 flex flex-wrap gap-4">
        <FilterInput
          id="y-from"
          label="From"
          type="date"
          value={params.get('from') ?? ''}
          onChange={(v) => set('from', v)}
        />
        <FilterInput id="y-to" label="To" type="date" value={params.get('to') ?? ''} onChange={(v) => set('to', v)} />
        <FilterSelect
          id="y-family"
          label="Family"
          placeholder="All families"
          options={families.map((f) => ({ value: f.code, label: `${f.code} · ${f.name}` }))}
          value={params.get('family') ?? ''}
          onChange={(v) => set('family', v)}
        />
      </div>
      {error && <Notice tone="bad">{error.message}</Notice>}
      {data && (
        <div className="mb-3">
          <DataAge readFrom={data.readFrom} />
        </div>
      )}
      <div className="grid grid-cols-1 gap-5">
        <Card labelledBy="fpy-heading">
          <CardHeader
            id="fpy-heading"
            title="First-pass yield per stage"
            description="Parts that passed a stage at their first attempt, of all that attempted it."
            actions={<CsvLink href={csvHref('/api/yields/export.csv', y)}>CSV</CsvLink>}
          />
          <CardBody>
            <ChartNumbers
              numbers={
                <TableFrame label="First-pass yield per stage and station">
                  <Table caption="First-pass yield per stage and station">
                    <THead>
                      <tr>
                        <TH>Stage</TH>
                        <TH>Station</TH>
                        <TH align="right">Entered</TH>
                        <TH align="right">First pass</TH>
                        <TH align="right">FPY</TH>
                      </tr>
                    </THead>
                    <TBody>
                      {(data?.byStage ?? []).flatMap((s) => [
                        <TR key={s.stageCode}>
                          <TD>{s.stageName}</TD>
                          <TD>all</TD>
                          <TD align="right">{s.entered}</TD>
                          <TD align="right">{s.firstPass}</TD>
                          <TD align="right">{percent(fpy(s))}</TD>
                        </TR>,
                        ...(data?.byStation ?? [])
                          .filter((r) => r.stageCode === s.stageCode)
                          .map((r) => (
                            <TR key={`${s.stageCode}-${r.station}`} muted>
                              <TD />
                              <TD mono>{r.station ?? '—'}</TD>
                              <TD align="right">{r.entered}</TD>
                              <TD align="right">{r.firstPass}</TD>
                              <TD align="right">{percent(fpy(r))}</TD>
                            </TR>
                          )),
                      ])}
                    </TBody>
                  </Table>
                </TableFrame>
              }
            >
              <BarChart
                labels={(data?.byStage ?? []).map((s) => s.stageCode)}
                values={(data?.byStage ?? []).map((s) => (fpy(s) ?? 0) * 100)}
                percent
                label="First-pass yield per stage in per cent; the numbers are below."
              />
            </ChartNumbers>
          </CardBody>
        </Card>
        <div className="grid grid-cols-1 gap-5 xl:grid-cols-2">
          <Card labelledBy="rty-heading">
            <CardHeader
              id="rty-heading"
              title="Rolled throughput yield"
              description="Per family: the product of its stages’ first-pass yields."
            />
            <TableFrame>
              <Table caption="Rolled throughput yield per family">
                <THead>
                  <tr>
                    <TH>Family</TH>
                    <TH align="right">Stages</TH>
                    <TH align="right">RTY</TH>
                  </tr>
                </THead>
                <TBody>
                  {(data?.byFamily ?? []).map((f) => (
                    <TR key={f.familyCode}>
                      <TD mono>{f.familyCode}</TD>
                      <TD align="right">{f.stages.length}</TD>
                      <TD align="right">{percent(f.rty)}</TD>
                    </TR>
                  ))}
                </TBody>
              </Table>
            </TableFrame>
          </Card>
          <Card labelledBy="losses-heading">
            <CardHeader
              id="losses-heading"
              title="Scrap and rework"
              description="NCR decisions signed in the period."
            />
            <CardBody>
              <dl className="grid grid-cols-2 gap-4 font-mono tabular-nums">
                {(
                  [
                    ['Scrapped', data?.losses.scrapped],
                    ['Reworked or repaired', data?.losses.reworked],
                    ['Used as is', data?.losses.usedAsIs],
                    ['Returned to supplier', data?.losses.returned],
                  ] as const
                ).map(([k, v]) => (
                  <div key={k}>
                    <dt className="font-sans text-sm text-ink-soft">{k}</dt>
                    <dd className="text-2xl font-semibold">{v ?? '…'}</dd>
                  </div>
                ))}
              </dl>
            </CardBody>
          </Card>
        </div>
        <Card labelledBy="salvage-heading">
          <CardHeader
            id="salvage-heading"
            title="Salvage by core source and casting number"
            description="Parts kept at teardown, less those scrapped later, of all major parts the cores gave (kept or scrapped at teardown)."
          />
          <TableFrame label="Salvage">
            <Table caption="Salvage by core source and casting number">
              <THead>
                <tr>
                  <TH>Source</TH>
                  <TH>Casting number</TH>
                  <TH align="right">Cores</TH>
                  <TH align="right">Kept</TH>
                  <TH align="right">Scrapped at teardown</TH>
                  <TH align="right">Scrapped later</TH>
                  <TH align="right">Salvage</TH>
                </tr>
              </THead>
              <TBody>
                {(data?.salvage ?? []).map((s) => (
                  <TR key={`${s.source}-${s.castingNumber}`}>
                    <TD>{s.source === 'purchased' ? 'Purchased' : 'Customer return'}</TD>
                    <TD mono>{s.castingNumber}</TD>
                    <TD align="right">{s.cores}</TD>
                    <TD align="right">{s.kept}</TD>
                    <TD align="right">{s.scrappedAtTeardown}</TD>
                    <TD align="right">{s.scrappedLater}</TD>
                    <TD align="right">{percent(s.salvageRate)}</TD>
                  </TR>
                ))}
              </TBody>
            </Table>
          </TableFrame>
        </Card>
        <Card labelledBy="pareto-heading">
          <CardHeader
            id="pareto-heading"
            title={`NCR Pareto (${p.data?.total ?? '…'} NCRs)`}
            description="NCRs raised in the period, most first; voided ones left out."
            actions={
              <>
                <FilterSelect
                  id="p-by"
                  label="By"
                  placeholder="Defect code"
                  options={[
                    { value: 'stage', label: 'Stage' },
                    { value: 'family', label: 'Family' },
                  ]}
                  value={pareto.by === 'defect' ? '' : pareto.by}
                  onChange={(v) => set('by', v)}
                />
                <FilterSelect
                  id="p-grain"
                  label="Per"
                  placeholder="Month"
                  options={[{ value: 'week', label: 'Week' }]}
                  value={pareto.grain === 'week' ? 'week' : ''}
                  onChange={(v) => set('grain', v)}
                />
                <CsvLink href={csvHref('/api/ncr-pareto/export.csv', pareto)}>CSV</CsvLink>
              </>
            }
          />
          <CardBody>
            <ChartNumbers
              numbers={
                <TableFrame label="NCR Pareto">
                  <Table caption="NCRs per key and per period">
                    <THead>
                      <tr>
                        <TH>{BY_WORDS[pareto.by]}</TH>
                        <TH>Name</TH>
                        <TH align="right">NCRs</TH>
                        <TH align="right">Cumulative</TH>
                        <TH>Per {pareto.grain}</TH>
                      </tr>
                    </THead>
                    <TBody>
                      {(p.data?.rows ?? []).map((r) => (
                        <TR key={r.key}>
                          <TD mono>{r.key}</TD>
                          <TD>{r.label}</TD>
                          <TD align="right">{r.count}</TD>
                          <TD align="right">{r.cumulativePct.toFixed(1)} %</TD>
                          <TD mono>
                            {(p.data?.periods ?? [])
                              .filter((x) => x.key === r.key)
                              .map((x) => `${x.period}: ${x.count}`)
                              .join(' · ')}
                          </TD>
                        </TR>
                      ))}
                    </TBody>
                  </Table>
                </TableFrame>
              }
            >
              <BarChart
                labels={(p.data?.rows ?? []).map((r) => r.key)}
                values={(p.data?.rows ?? []).map((r) => r.count)}
                label={`NCRs per ${BY_WORDS[pareto.by].toLowerCase()}, most first; the numbers are below.`}
              />
            </ChartNumbers>
          </CardBody>
        </Card>
      </div>
    </>
  );
}
