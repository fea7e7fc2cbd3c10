import type { QueryClient } from '@tanstack/react-query';
import { createColumnHelper, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router';
import type { LotLookupJson } from '../../../shared/schemas/trail';
import { lotQueryOptions, normalLotCode, useLot } from '../../api/trail/lot';
import { DataTable } from '../../components/data-table';
import { StatusBadge } from '../../components/item-status';
import { DataAge } from '../../components/data-age';
import { PageHeader } from '../../components/page-header';
import { Badge, type Tone } from '../../components/ui/badge';
import { Button, ButtonLink } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { downloadCsv, toCsv } from '../../lib/csv';
import { formatWhen, plural } from '../../lib/format';
import { paths, trailHref } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { LotSearch } from './lot-search';
import { lotKindLabel } from './trail-lots';

export const lotLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'trail.read');
    // a failure is said on the page, beside the lot code
    await queryClient.prefetchQuery(lotQueryOptions(params.lotCode ?? ''));
    return null;
  };

type Lot = LotLookupJson['lots'][number];
type Unit = Lot['units'][number];

const LOT_STATUS: Record<string, { label: string; tone: Tone }> = {
  usable: { label: 'Usable', tone: 'ok' },
  held: { label: 'Held', tone: 'hold' },
  quarantined: { label: 'Held', tone: 'hold' },
  returned: { label: 'Returned to supplier', tone: 'off' },
  scrapped: { label: 'Scrapped', tone: 'bad' },
};
function LotStatus({ status }: { status: string }) {
  const s = LOT_STATUS[status] ?? { label: status.replace(/_/g, ' '), tone: 'neutral' as Tone };
  return <Badge tone={s.tone}>{s.label}</Badge>;
}

const col = createColumnHelper<Unit>();
const columns = [
  col.accessor('serial', {
    header: 'Serial',
    meta: { mono: true, nowrap: true },
    cell: (c) => (
      <Link
        to={trailHref(c.getValue())}
        className="inline-flex items-center font-semibold text-accent underline-offset-4 hover:underline floor:min-h-12"
      >
        {c.getValue()}
      </Link>
    ),
  }),
  col.accessor('family', { header: 'Family', meta: { mono: true, nowrap: true } }),
  col.accessor('status', { header: 'Status', cell: (c) => <StatusBadge status={c.getValue()} /> }),
  col.accessor('installedAt', {
    header: 'Installed',
    meta: { mono: true, nowrap: true },
    cell: (c) => formatWhen(c.getValue()),
  }),
  col.accessor('shipDate', {
    header: 'Ship date',
    meta: { mono: true, nowrap: true },
    cell: (c) => c.getValue() ?? <span className="font-sans text-ink-soft">Not shipped</span>,
  }),
  col.accessor('customer', { header: 'Customer', cell: (c) => c.getValue() ?? '—' }),
];

function UnitsTable({ lot }: { lot: Lot }) {
  // eslint-disable-next-line react-hooks/incompatible-library -- the table instance is rebuilt each render by design
  const table = useReactTable({
    data: lot.units,
    columns,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (u) => u.serial,
  });
  return (
    <DataTable
      table={table}
      caption={`Units with ${lotKindLabel(lot.kind).toLowerCase()} lot ${lot.lotCode} from ${lot.supplier}`}
      empty="This lot has not gone into any unit yet."
    />
  );
}

function exportUnits(lot: Lot) {
  const csv = toCsv(lot.units, [
    { header: 'Serial', value: (u) => u.serial },
    { header: 'Family', value: (u) => u.family },
    { header: 'Status', value: (u) => u.status },
    { header: 'Installed', value: (u) => u.installedAt },
    { header: 'Ship date', value: (u) => u.shipDate },
    { header: 'Customer', value: (u) => u.customer },
  ]);
  downloadCsv(`lot-${lot.lotCode}-${lot.partNumber}-units.csv`, csv);
}

function LotCard({ lot, index }: { lot: Lot; index: number }) {
  const shipped = lot.units.filter((u) => u.shipDate).length;
  const headingId = `lot-${index}-heading`;
  return (
    <Card labelledBy={headingId}>
      <CardHeader
        id={headingId}
        title={
          <>
            {lotKindLabel(lot.kind)} · <span className="font-mono">{lot.lotCode}</span>
          </>
        }
        description={
          <>
            {lot.supplier} · part number <span className="font-mono">{lot.partNumber}</span>
          </>
        }
        actions={
          <>
            <LotStatus status={lot.status} />
            <span className="text-sm text-ink-soft">
              {plural(lot.units.length, 'unit')}, {shipped} shipped
            </span>
            <Button size="sm" icon="download" onClick={() => exportUnits(lot)} disabled={lot.units.length === 0}>
              Export CSV
            </Button>
          </>
        }
      />
      <UnitsTable lot={lot} />
    </Card>
  );
}

export function LotPage() {
  const code = normalLotCode(useParams().lotCode ?? '');
  const lot = useLot(code);
  return (
    <div className="mx-auto max-w-page">
      <PageHeader
        title={
          <>
            Lot <span className="font-mono">{code}</span>
          </>
        }
        description="Every purchased lot with this code, and each unit it went into: who has it and since when."
        actions={
          <ButtonLink to={paths.trail} variant="quiet">
            Trail
          </ButtonLink>
        }
      />
      <div className="flex flex-col gap-5">
        <Card as="div">
          <CardBody>
            <div className="max-w-xl">
              <LotSearch key={code} initial={code} />
            </div>
          </CardBody>
        </Card>
        {lot.error ? (
          <Notice tone="bad" live="alert">
            {lot.error.message}
          </Notice>
        ) : !lot.data ? (
          <p className="text-ink-soft">Loading lot {code}…</p>
        ) : lot.data.readFrom.source === 'standby' && lot.data.lots.length > 0 ? (
          <>
            <DataAge readFrom={lot.data.readFrom} />
            {lot.data.lots.map((l, i) => (
              <LotCard key={`${l.supplier}/${l.partNumber}/${l.lotCode}`} lot={l} index={i} />
            ))}
          </>
        ) : lot.data.lots.length === 0 ? (
          <Notice tone="info" title="No such lot">
            No purchased lot with the code {code} has been recorded. Check the box label; codes are matched without
            regard to case.
          </Notice>
        ) : (
          lot.data.lots.map((l, i) => <LotCard key={`${l.supplier}/${l.partNumber}/${l.lotCode}`} lot={l} index={i} />)
        )}
      </div>
    </div>
  );
}
