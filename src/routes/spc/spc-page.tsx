import type { QueryClient } from '@tanstack/react-query';
import { redirect, type LoaderFunctionArgs } from 'react-router';
import { CHART_METHOD_LABELS, CHART_METHODS, type ChartMethod } from '../../../shared/schemas/spc';
import { useSignedIn } from '../../api/auth/me';
import { familiesQueryOptions, useFamilies } from '../../api/reference/families';
import { specBookQueryOptions, useSpecBook } from '../../api/spec/book';
import { spcCapabilityQueryOptions, useSpcCapability } from '../../api/spc/capability';
import { spcChartQueryOptions, useSpcChart } from '../../api/spc/chart';
import { FilterInput, FilterSelect } from '../../components/filter-fields';
import { PageHeader } from '../../components/page-header';
import { Button } from '../../components/ui/button';
import { Card } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { type OptionGroup } from '../../components/ui/select';
import { Field } from '../../components/ui/field';
import { Select } from '../../components/ui/select';
import { plural } from '../../lib/format';
import { paths } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { useUrlFilter } from '../../lib/use-url-filter';
import { CapabilityCard } from './capability-card';
import { ChartsCard } from './charts-card';
import { defaultCharacteristic, defaultPeriod, measured, spcFilterFrom } from './filter';
import { LimitsCard } from './limits-card';
import { CsvButton } from './numbers-panel';
import { decimalsOf } from './numbers';
import { StationSignalsCard } from './station-signals-card';

export const spcLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'spc.read');
    const url = new URL(request.url);
    const families = await queryClient.ensureQueryData(familiesQueryOptions());
    const p = url.searchParams;
    const family = (p.get('family') ?? (families.find((f) => f.active) ?? families[0])?.code ?? '').toUpperCase();
    if (!family || !families.some((f) => f.code === family)) return null; // said on the page
    const book = await queryClient.ensureQueryData(specBookQueryOptions(family));
    if (!p.get('family') || !p.get('characteristic') || !p.get('from') || !p.get('to')) {
      // the address always names what is charted, so a copied link opens the same chart
      const next = new URLSearchParams(p);
      const period = defaultPeriod();
      next.set('family', family);
      if (!p.get('characteristic')) next.set('characteristic', String(defaultCharacteristic(book) ?? ''));
      if (!p.get('from')) next.set('from', period.from);
      if (!p.get('to')) next.set('to', period.to);
      throw redirect(`${paths.spc}?${next.toString()}`);
    }
    const filter = spcFilterFrom(p);
    if (filter) {
      // a refused filter (bad dates, unknown station) is said on the page, not as an error page
      await Promise.allSettled([
        queryClient.ensureQueryData(spcChartQueryOptions(filter)),
        queryClient.ensureQueryData(
          spcCapabilityQueryOptions({
            family: filter.family,
            characteristicId: filter.characteristicId,
            from: filter.from,
            to: filter.to,
          }),
        ),
      ]);
    }
    return null;
  };

const chartOptions = CHART_METHODS.map((m) => ({
  value: m,
  label: m === 'auto' ? 'Usual for this characteristic' : CHART_METHOD_LABELS[m as ChartMethod],
}));

export function SpcPage() {
  const me = useSignedIn();
  const { params, set, setMany } = useUrlFilter();
  const filter = spcFilterFrom(params);
  const families = useFamilies();
  const book = useSpecBook(filter?.family ?? params.get('family'));
  const chart = useSpcChart(filter);
  const byGroup = useSpcCapability(
    filter
      ? { family: filter.family, characteristicId: filter.characteristicId, from: filter.from, to: filter.to }
      : null,
  );
  if (!me) return null;

  const familyOptions = (families.data ?? []).map((f) => ({ value: f.code, label: `${f.code} — ${f.name}` }));
  const groups: OptionGroup[] = [];
  for (const c of book.data ? measured(book.data) : []) {
    let g = groups.find((x) => x.label === c.stage);
    if (!g) groups.push((g = { label: c.stage, options: [] }));
    g.options.push({ value: String(c.id), label: `${c.name}${c.critical ? ' (critical)' : ''}` });
  }
  const rows = byGroup.data?.rows.slice(1) ?? [];
  const stationOptions = [...new Set(rows.map((r) => r.station).filter((s): s is string => !!s))].map((s) => ({
    value: s,
    label: s,
  }));
  if (filter?.station && !stationOptions.some((o) => o.value === filter.station)) {
    stationOptions.push({ value: filter.station, label: filter.station });
  }
  const gaugeOptions = [...new Set(rows.map((r) => r.gauge).filter((g): g is string => !!g))].map((g) => ({
    value: g,
    label: g,
  }));
  if (filter?.gauge && !gaugeOptions.some((o) => o.value === filter.gauge)) {
    gaugeOptions.push({ value: filter.gauge, label: filter.gauge });
  }
  const data = chart.data;
  const characteristic = book.data ? measured(book.data).find((c) => c.id === filter?.characteristicId) : undefined;
  const digits = decimalsOf(characteristic?.inForce?.resolution ?? characteristic?.resolution);
  const oneReading = data ? data.method === 'i-mr' || (data.subgroupSize === 1 && data.method !== 'part-means') : false;
  const subgrouped = data && (data.method === 'xbar-r' || data.method === 'xbar-s') && data.points.length > 0;

  return (
    <>
      <PageHeader
        title="Control charts and capability"
        description="Is the process stable, and does it fit the tolerance? Readings of one family’s characteristic over a period, charted in the order they were recorded, with run-rule signals and capability."
      />
      <div className="flex flex-col gap-5">
        <Card labelledBy="spc-filter-heading">
          <h2 id="spc-filter-heading" className="sr-only">
            What to chart
          </h2>
          <form
            role="search"
            aria-label="What to chart"
            data-density="floor"
            onSubmit={(e) => e.preventDefault()}
            className="grid grid-cols-2 gap-3 px-5 py-4 md:grid-cols-4"
          >
            <FilterSelect
              id="spc-family"
              label="Engine family"
              placeholder="Choose a family"
              options={familyOptions}
              value={filter?.family ?? params.get('family') ?? ''}
              onChange={(v) =>
                setMany({ family: v, characteristic: '', station: '', gauge: '', baselineFrom: '', baselineTo: '' })
              }
            />
            <div className="col-span-2 md:col-span-3">
              <Field id="spc-characteristic" label="Characteristic">
                <Select
                  id="spc-characteristic"
                  placeholder="Choose a measured characteristic"
                  groups={groups}
                  value={filter ? String(filter.characteristicId) : ''}
                  onChange={(e) =>
                    setMany({
                      characteristic: e.target.value,
                      chart: '',
                      subgroup: '',
                      baselineFrom: '',
                      baselineTo: '',
                    })
                  }
                />
              </Field>
            </div>
            <FilterInput
              id="spc-from"
              label="From"
              type="date"
              value={filter?.from ?? ''}
              onChange={(v) => set('from', v)}
            />
            <FilterInput
              id="spc-to"
              label="To (included)"
              type="date"
              value={filter?.to ?? ''}
              onChange={(v) => set('to', v)}
            />
            <FilterSelect
              id="spc-station"
              label="Station"
              placeholder="Every station"
              options={stationOptions}
              value={filter?.station ?? ''}
              onChange={(v) => set('station', v)}
            />
            <FilterSelect
              id="spc-gauge"
              label="Gauge"
              placeholder="Every gauge"
              options={gaugeOptions}
              value={filter?.gauge ?? ''}
              onChange={(v) => set('gauge', v)}
            />
            <Field id="spc-chart" label="Chart">
              <Select
                id="spc-chart"
                options={chartOptions}
                value={filter?.chart ?? 'auto'}
                onChange={(e) => setMany({ chart: e.target.value === 'auto' ? '' : e.target.value, subgroup: '' })}
              />
            </Field>
            {oneReading && subgrouped && (
              <FilterSelect
                id="spc-subgroup"
                label="Parts per subgroup"
                placeholder="5 (usual)"
                options={[2, 3, 4, 5, 6, 8, 10].map((n) => ({ value: String(n), label: String(n) }))}
                value={filter?.subgroup ? String(filter.subgroup) : ''}
                onChange={(v) => set('subgroup', v)}
              />
            )}
            <Field id="spc-limits" label="Limits">
              <Select
                id="spc-limits"
                options={[
                  { value: 'frozen', label: 'Frozen, where there are some' },
                  { value: 'trial', label: 'Trial, from a baseline' },
                ]}
                value={filter?.limits ?? 'frozen'}
                onChange={(e) => set('limits', e.target.value === 'trial' ? 'trial' : '')}
              />
            </Field>
            {data?.limits?.source === 'trial' && (
              <>
                <FilterInput
                  id="spc-baseline-from"
                  label="Baseline from"
                  type="date"
                  value={filter?.baselineFrom ?? ''}
                  onChange={(v) => set('baselineFrom', v)}
                />
                <FilterInput
                  id="spc-baseline-to"
                  label="Baseline to"
                  type="date"
                  value={filter?.baselineTo ?? ''}
                  onChange={(v) => set('baselineTo', v)}
                />
              </>
            )}
            <div className="col-span-2 flex flex-wrap items-end justify-between gap-3 md:col-span-4">
              <p aria-live="polite" className="font-medium">
                {data ? (
                  <>
                    {plural(data.points.length, 'point')}{' '}
                    <span className="font-normal text-ink-soft">
                      from {plural(data.readings, 'reading')} of {data.family.code}{' '}
                      {data.characteristic.name.toLowerCase()}
                      {data.station ? ` at ${data.station}` : ''}
                      {data.gauge ? ` with ${data.gauge}` : ''}
                    </span>
                  </>
                ) : (
                  '…'
                )}
              </p>
              <div className="flex flex-wrap items-center gap-2">
                {data && data.charts.length > 0 && (
                  <CsvButton
                    filename={`${data.family.code}-${data.characteristic.code}-${filter?.from}-${filter?.to}-points.csv`}
                    rows={data.points.map((p, i) => ({ p, i }))}
                    columns={[
                      { header: 'Point', text: (r) => String(r.i + 1) },
                      { header: 'Serial', text: (r) => r.p.serial },
                      { header: 'Recorded', text: (r) => r.p.at },
                      { header: 'Station', text: (r) => r.p.station ?? '' },
                      ...data.charts.map((c) => ({
                        header: c.label,
                        text: (r: { i: number }) => String(c.values[r.i] ?? ''),
                      })),
                    ]}
                  />
                )}
                {(filter?.station || filter?.gauge || filter?.chart || filter?.limits || filter?.baselineFrom) && (
                  <Button
                    onClick={() =>
                      setMany({
                        station: '',
                        gauge: '',
                        chart: '',
                        subgroup: '',
                        limits: '',
                        baselineFrom: '',
                        baselineTo: '',
                      })
                    }
                  >
                    Clear the other choices
                  </Button>
                )}
              </div>
            </div>
          </form>
        </Card>
        {!filter && <Notice tone="info">Choose a family, a characteristic and a period.</Notice>}
        {chart.error && (
          <Notice tone="bad" live="alert">
            {chart.error.message}
          </Notice>
        )}
        {data && data.notes.length > 0 && (
          <Notice tone="info" title="About this chart">
            <ul className="list-disc pl-5">
              {data.notes.map((n) => (
                <li key={n}>{n}</li>
              ))}
            </ul>
          </Notice>
        )}
        {data && filter && (
          <div
            className={`flex flex-col gap-5 ${chart.isPlaceholderData ? 'opacity-60' : ''}`}
            aria-busy={chart.isPlaceholderData}
          >
            <LimitsCard chart={data} canFreeze={me.can('spc.freeze')} from={filter.from} to={filter.to} />
            {data.charts.length > 0 && <ChartsCard chart={data} digits={digits} />}
            <CapabilityCard chart={data} byGroup={byGroup.data} digits={digits} />
            <StationSignalsCard
              family={data.family.code}
              characteristicId={data.characteristic.id}
              canHold={me.can('spc.hold')}
              digits={digits}
            />
          </div>
        )}
      </div>
    </>
  );
}
