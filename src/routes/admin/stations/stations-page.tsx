import type { QueryClient } from '@tanstack/react-query';
import { createColumnHelper, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import { Link, type LoaderFunctionArgs } from 'react-router';
import type { Station } from '../../../../shared/schemas/reference';
import { stagesQueryOptions } from '../../../api/reference/stages';
import { stationsQueryOptions, useStations } from '../../../api/reference/stations';
import { DataTable } from '../../../components/data-table';
import { PageHeader } from '../../../components/page-header';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { Card, CardFooter } from '../../../components/ui/card';
import { Notice } from '../../../components/ui/notice';
import { plural } from '../../../lib/format';
import { auditHref } from '../../../lib/paths';
import { requirePermission } from '../../../lib/session';
import { AddStationDialog, EditStationDialog, ServiceDialog } from './station-dialogs';

export const stationsLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'stations.manage');
    await Promise.all([
      queryClient.ensureQueryData(stationsQueryOptions()),
      queryClient.ensureQueryData(stagesQueryOptions()),
    ]);
    return null;
  };

type Open = { kind: 'add' } | { kind: 'edit' | 'service'; station: Station } | null;
const col = createColumnHelper<Station>();

export function StationsPage() {
  const stations = useStations();
  const [open, setOpen] = useState<Open>(null);
  const rows = stations.data ?? [];
  const inService = rows.filter((s) => s.active).length;

  const columns = useMemo(
    () => [
      col.accessor('code', {
        header: 'Code',
        meta: { mono: true, nowrap: true },
        cell: (c) => <span className="font-medium">{c.getValue()}</span>,
      }),
      col.accessor('name', { header: 'Name' }),
      col.accessor('stageName', {
        header: 'Stage it records',
        cell: (c) =>
          c.getValue() ? (
            <span className="flex flex-col leading-snug">
              <span>{c.getValue()}</span>
              <span className="font-mono text-sm text-ink-faint">{c.row.original.stageCode}</span>
            </span>
          ) : (
            <span className="text-ink-soft">No stage</span>
          ),
      }),
      col.accessor('location', {
        header: 'Location',
        cell: (c) => c.getValue() || <span className="text-ink-soft">—</span>,
      }),
      col.accessor('active', {
        header: 'Service',
        meta: { nowrap: true },
        cell: (c) => (c.getValue() ? <Badge tone="ok">In service</Badge> : <Badge tone="off">Out of service</Badge>),
      }),
      col.display({
        id: 'actions',
        header: () => <span className="sr-only">Actions</span>,
        meta: { nowrap: true },
        cell: (c) => {
          const s = c.row.original;
          return (
            <span className="inline-flex items-center gap-1.5">
              <Button size="sm" aria-label={`Edit ${s.code}`} onClick={() => setOpen({ kind: 'edit', station: s })}>
                Edit
              </Button>
              {s.active ? (
                <Button
                  size="sm"
                  aria-label={`Take ${s.code} out of service`}
                  onClick={() => setOpen({ kind: 'service', station: s })}
                >
                  Take out of service
                </Button>
              ) : (
                <Button
                  size="sm"
                  aria-label={`Return ${s.code} to service`}
                  onClick={() => setOpen({ kind: 'service', station: s })}
                >
                  Return to service
                </Button>
              )}
              <Link
                to={auditHref({ entity: 'station', entityId: s.id })}
                className="px-1.5 text-sm text-accent underline-offset-4 hover:underline"
                aria-label={`History of ${s.code}`}
              >
                History
              </Link>
            </span>
          );
        },
      }),
    ],
    [],
  );

  // eslint-disable-next-line react-hooks/incompatible-library -- the table instance is rebuilt each render by design
  const table = useReactTable({
    data: rows,
    columns,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (s) => String(s.id),
  });
  const close = () => setOpen(null);

  return (
    <>
      <PageHeader
        title="Stations"
        description="Each station on the floor records one stage. A station out of service keeps its history but takes no new results."
        actions={
          <Button variant="primary" icon="plus" onClick={() => setOpen({ kind: 'add' })}>
            Add station
          </Button>
        }
      />
      <Card labelledBy="stations-heading">
        <h2 id="stations-heading" className="sr-only">
          List of stations
        </h2>
        {stations.error && (
          <div className="px-5 pt-4">
            <Notice tone="bad" live="alert">
              {stations.error.message}
            </Notice>
          </div>
        )}
        <DataTable
          table={table}
          caption="Stations"
          empty="No stations yet. Add the first one."
          muted={(s) => !s.active}
        />
        <CardFooter>
          <p className="text-sm text-ink-soft" aria-live="polite">
            {plural(rows.length, 'station')}, {inService} in service
          </p>
        </CardFooter>
      </Card>
      {open?.kind === 'add' && <AddStationDialog onClose={close} />}
      {open?.kind === 'edit' && <EditStationDialog station={open.station} onClose={close} />}
      {open?.kind === 'service' && <ServiceDialog station={open.station} onClose={close} />}
    </>
  );
}
