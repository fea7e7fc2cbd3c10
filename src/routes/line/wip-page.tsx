import type { QueryClient } from '@tanstack/react-query';
import { Link, type LoaderFunctionArgs } from 'react-router';
import { PART_KINDS, PART_KIND_LABELS } from '../../../shared/schemas/reference';
import type { WipQuery } from '../../../shared/schemas/line';
import { useSignedIn } from '../../api/auth/me';
import { useShipping, useWip, wipQueryOptions } from '../../api/line/line';
import { familiesQueryOptions, useFamilies } from '../../api/reference/families';
import { FilterInput, FilterSelect } from '../../components/filter-fields';
import { DataAge } from '../../components/data-age';
import { PageHeader } from '../../components/page-header';
import { Badge } from '../../components/ui/badge';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Table, TableFrame, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { itemHref, paths } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { useDebouncedText, useUrlFilter } from '../../lib/use-url-filter';
import { BarChart, ChartNumbers } from './bar-chart';
import { WIP_STATE_WORDS, formatAge } from './words';

const filterFrom = (p: URLSearchParams, familyId: (code: string) => number | undefined): WipQuery => {
  const kind = p.get('kind');
  const stage = p.get('stage')?.trim();
  const serial = p.get('serial')?.trim();
  return {
    family: p.get('family') ? familyId(p.get('family')!) : undefined,
    kind: PART_KINDS.includes(kind as never) ? (kind as WipQuery['kind']) : undefined,
    stage: stage && stage.length <= 40 ? stage : undefined,
    serial: serial && serial.length >= 2 && serial.length <= 40 ? serial : undefined,
    // one stage, or a serial typed: every match (up to 500) rather than the oldest few per stage
    perStage: stage || serial ? 500 : undefined,
  };
};

export const wipLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'wip.read');
    const families = await queryClient.ensureQueryData(familiesQueryOptions());
    const q = filterFrom(new URL(request.url).searchParams, (c) => families.find((f) => f.code === c)?.id);
    await queryClient.ensureQueryData(wipQueryOptions(q)).catch(() => null);
    return null;
  };

const SHIFTS = ['06–14', '14–22', '22–06'];

function Throughput({ rows }: { rows: { day: string; shift: number; passed: number; failed: number }[] }) {
  const days = [...new Set(rows.map((r) => r.day))].sort();
  const perDay = days.map((d) => rows.filter((r) => r.day === d).reduce((s, r) => s + r.passed, 0));
  const cell = (day: string, shift: number, k: 'passed' | 'failed') =>
    rows.filter((r) => r.day === day && r.shift === shift).reduce((s, r) => s + r[k], 0);
  return (
    <Card labelledBy="throughput-heading">
      <CardHeader
        id="throughput-heading"
        title="Throughput"
        description="Stage results that passed, per day over the last 7 days; per shift in the numbers."
      />
      <CardBody>
        {days.length === 0 ? (
          <p className="text-ink-soft">No results in the last 7 days.</p>
        ) : (
          <ChartNumbers
            numbers={
              <TableFrame label="Throughput per day and shift">
                <Table caption="Passed and failed results per day and shift">
                  <THead>
                    <tr>
                      <TH>Day</TH>
                      {SHIFTS.map((s) => (
                        <TH key={s} align="right">
                          Shift {s}
                        </TH>
                      ))}
                      <TH align="right">Day total</TH>
                    </tr>
                  </THead>
                  <TBody>
                    {days.map((d, i) => (
                      <TR key={d}>
                        <TD mono>{d}</TD>
                        {[1, 2, 3].map((s) => (
                          <TD key={s} align="right">
                            {cell(d, s, 'passed')} passed · {cell(d, s, 'failed')} failed
                          </TD>
                        ))}
                        <TD align="right">{perDay[i]}</TD>
                      </TR>
                    ))}
                  </TBody>
                </Table>
              </TableFrame>
            }
          >
            <BarChart
              labels={days.map((d) => d.slice(5))}
              values={perDay}
              label="Passed results per day; the numbers are below."
            />
          </ChartNumbers>
        )}
      </CardBody>
    </Card>
  );
}

function ReadyToShip() {
  const q = useShipping();
  return (
    <Card labelledBy="ready-ship-heading">
      <CardHeader id="ready-ship-heading" title={`Ready to ship (${q.data?.ready.length ?? '…'})`} />
      <CardBody>
        {(q.data?.ready ?? []).length === 0 ? (
          <p className="text-ink-soft">No unit is ready to ship.</p>
        ) : (
          <ul className="divide-y divide-rule">
            {q.data!.ready.map((u) => (
              <li key={u.serial}>
                <Link
                  to={`${paths.release}?serial=${encodeURIComponent(u.serial)}`}
                  className="flex min-h-11 floor:min-h-12 items-center gap-3 text-accent underline-offset-4 hover:underline"
                >
                  <Badge tone="ok">Ready</Badge>
                  <span className="font-mono font-semibold">{u.serial}</span>
                  <span className="text-ink-soft">{u.familyCode}</span>
                </Link>
              </li>
            ))}
          </ul>
        )}
        {q.data && q.data.blocked.length > 0 && (
          <p className="mt-2 text-sm text-ink-soft">
            {q.data.blocked.length} more built and blocked by the release gate.
          </p>
        )}
      </CardBody>
    </Card>
  );
}

/** The address with one stage chosen, the other filters kept. */
const stageSearch = (params: URLSearchParams, stage: string) => {
  const next = new URLSearchParams(params);
  next.set('stage', stage);
  return next.toString();
};

export function WipPage() {
  const me = useSignedIn();
  const { params, set } = useUrlFilter();
  const families = useFamilies().data ?? [];
  const q = filterFrom(params, (c) => families.find((f) => f.code === c)?.id);
  const wip = useWip(q);
  const data = wip.data;
  const [serial, onSerial] = useDebouncedText(params.get('serial') ?? '', (v) => set('serial', v));
  const stageName = q.stage ? (data?.stages.find((s) => s.stageCode === q.stage)?.stageName ?? q.stage) : null;
  const shown = data?.items.length ?? 0;
  return (
    <>
      <PageHeader
        title="Work in process"
        description="Every part and unit on the floor by stage and station: waiting, in work again after a rework or re-entry, or on hold; with ages."
      />
      <div className="mb-4 flex flex-wrap gap-4">
        <FilterSelect
          id="wip-family"
          label="Family"
          placeholder="All families"
          options={families.map((f) => ({ value: f.code, label: `${f.code} · ${f.name}` }))}
          value={params.get('family') ?? ''}
          onChange={(v) => set('family', v)}
        />
        <FilterSelect
          id="wip-kind"
          label="Part kind"
          placeholder="All kinds"
          options={PART_KINDS.map((k) => ({ value: k, label: PART_KIND_LABELS[k] }))}
          value={params.get('kind') ?? ''}
          onChange={(v) => set('kind', v)}
        />
        <FilterInput id="wip-serial" label="Serial contains" value={serial} onChange={onSerial} />
        {q.stage && (
          <p className="self-end pb-2">
            Stage: <strong>{stageName}</strong>{' '}
            <button type="button" className="ml-2 min-h-11 text-accent underline" onClick={() => set('stage', '')}>
              All stages
            </button>
          </p>
        )}
      </div>
      {data && (
        <div className="mb-3">
          <DataAge readFrom={data.readFrom} />
        </div>
      )}
      <div className="grid grid-cols-1 gap-5">
        <Card labelledBy="board-heading">
          <CardHeader
            id="board-heading"
            title="By stage"
            description={data ? `As of ${new Date(data.asOf).toLocaleTimeString()}` : ''}
          />
          <TableFrame label="Work in process by stage">
            <Table caption="Parts at each stage">
              <THead>
                <tr>
                  <TH>Stage</TH>
                  <TH>Part kind</TH>
                  <TH wideOnly>Stations</TH>
                  <TH align="right">Waiting</TH>
                  <TH align="right">In work</TH>
                  <TH align="right">On hold</TH>
                  <TH align="right">Oldest</TH>
                </tr>
              </THead>
              <TBody>
                {(data?.stages ?? []).map((s) => (
                  <TR key={s.stageCode} muted={s.waiting + s.inWork + s.onHold === 0}>
                    <TD>
                      <Link
                        to={`?${stageSearch(params, s.stageCode)}`}
                        className="inline-flex min-h-11 min-w-12 items-center text-accent underline floor:min-h-12"
                      >
                        {s.stageName}
                      </Link>
                    </TD>
                    <TD>{PART_KIND_LABELS[s.partKind as keyof typeof PART_KIND_LABELS] ?? s.partKind}</TD>
                    <TD mono wideOnly>
                      {s.stations.join(', ')}
                    </TD>
                    <TD align="right">{s.waiting}</TD>
                    <TD align="right">{s.inWork}</TD>
                    <TD align="right">{s.onHold}</TD>
                    <TD align="right">{s.oldestHours === null ? '—' : formatAge(s.oldestHours)}</TD>
                  </TR>
                ))}
              </TBody>
            </Table>
          </TableFrame>
        </Card>
        <div className="grid grid-cols-1 gap-5 xl:grid-cols-2">
          <Card labelledBy="holds-heading">
            <CardHeader
              id="holds-heading"
              title="Holds by age"
              description="Parts on hold, by how long since the hold began."
            />
            <CardBody>
              <ChartNumbers
                numbers={
                  <ul className="font-mono">
                    {(data?.holdAges ?? []).map((h) => (
                      <li key={h.label}>
                        {h.label}: {h.count}
                      </li>
                    ))}
                  </ul>
                }
              >
                <BarChart
                  labels={(data?.holdAges ?? []).map((h) => h.label)}
                  values={(data?.holdAges ?? []).map((h) => h.count)}
                  label="Parts on hold by age of the hold; the numbers are below."
                  height={180}
                />
              </ChartNumbers>
            </CardBody>
          </Card>
          <Throughput rows={data?.throughput ?? []} />
        </div>
        {me?.can('release.check') && <ReadyToShip />}
        <Card labelledBy="parts-heading">
          <CardHeader
            id="parts-heading"
            title={`Parts and units (${data ? data.itemCount.toLocaleString() : '…'})`}
            description={
              !data
                ? 'Oldest first.'
                : shown < data.itemCount
                  ? `Oldest first: the ${data.perStage} oldest at each stage, ${shown.toLocaleString()} of ${data.itemCount.toLocaleString()}. Choose a stage or type part of a serial to see the rest.`
                  : 'Oldest first.'
            }
          />
          <TableFrame label="Parts in process">
            <Table caption="Parts in process">
              <THead>
                <tr>
                  <TH>Serial</TH>
                  <TH>State</TH>
                  <TH>Stage</TH>
                  <TH>Family</TH>
                  <TH align="right">Age</TH>
                  <TH>NCR</TH>
                </tr>
              </THead>
              <TBody>
                {(data?.items ?? []).map((i) => (
                  <TR key={i.serial}>
                    <TD mono>
                      <Link to={itemHref(i.serial)} className="text-accent underline">
                        {i.serial}
                      </Link>
                    </TD>
                    <TD>
                      <Badge tone={i.state === 'on_hold' ? 'hold' : i.state === 'in_work' ? 'accent' : 'wait'}>
                        {WIP_STATE_WORDS[i.state]}
                      </Badge>
                    </TD>
                    <TD>{i.stageName}</TD>
                    <TD mono>{i.familyCode}</TD>
                    <TD align="right">{formatAge(i.ageHours)}</TD>
                    <TD mono>
                      {i.ncr && (
                        <Link to={`/ncrs/${encodeURIComponent(i.ncr)}`} className="text-accent underline">
                          {i.ncr}
                        </Link>
                      )}
                    </TD>
                  </TR>
                ))}
              </TBody>
            </Table>
          </TableFrame>
        </Card>
      </div>
    </>
  );
}
