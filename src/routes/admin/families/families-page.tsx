import type { QueryClient } from '@tanstack/react-query';
import { createColumnHelper, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import { Link, type LoaderFunctionArgs } from 'react-router';
import type { EngineFamily } from '../../../../shared/schemas/reference';
import { familiesQueryOptions, useFamilies } from '../../../api/reference/families';
import { DataTable } from '../../../components/data-table';
import { PageHeader } from '../../../components/page-header';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { Card, CardFooter } from '../../../components/ui/card';
import { Notice } from '../../../components/ui/notice';
import { formatGrouped, plural, sharedDecimals } from '../../../lib/format';
import { auditHref } from '../../../lib/paths';
import { requirePermission } from '../../../lib/session';
import { FamilyDialog } from './family-dialog';

export const familiesLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'families.manage');
    await queryClient.ensureQueryData(familiesQueryOptions());
    return null;
  };

export const layoutLabel = (f: Pick<EngineFamily, 'layout' | 'cylinders'>) =>
  f.layout === 'v' ? `V${f.cylinders}` : `Inline ${f.cylinders}`;

export function warrantyLabel(f: Pick<EngineFamily, 'warrantyMonths' | 'warrantyKm'>): string {
  const months = `${f.warrantyMonths} months`;
  return f.warrantyKm === null ? months : `${months}, ${formatGrouped(f.warrantyKm)} km`;
}

type Open = { kind: 'add' } | { kind: 'edit'; family: EngineFamily } | null;
const col = createColumnHelper<EngineFamily>();

export function FamiliesPage() {
  const families = useFamilies();
  const [open, setOpen] = useState<Open>(null);
  const rows = families.data ?? [];
  const decimals = sharedDecimals(rows.flatMap((f) => [f.boreMm, f.strokeMm]));

  const columns = useMemo(
    () => [
      col.accessor('code', {
        header: 'Family',
        cell: (c) => (
          <span className="flex flex-col leading-snug">
            <span className="font-mono font-semibold">{c.getValue()}</span>
            <span>
              {c.row.original.name} {!c.row.original.active && <Badge tone="off">Retired</Badge>}
            </span>
          </span>
        ),
      }),
      col.display({ id: 'layout', header: 'Layout', meta: { nowrap: true }, cell: (c) => layoutLabel(c.row.original) }),
      col.accessor('cylinders', { header: 'Cylinders', meta: { align: 'right', mono: true } }),
      col.display({
        id: 'boreStroke',
        header: 'Bore × stroke, mm',
        meta: { align: 'right', mono: true, nowrap: true },
        cell: (c) => `${c.row.original.boreMm.toFixed(decimals)} × ${c.row.original.strokeMm.toFixed(decimals)}`,
      }),
      col.accessor('displacementL', {
        header: 'Displacement, L',
        meta: { align: 'right', mono: true },
        cell: (c) => c.getValue().toFixed(2),
      }),
      col.accessor('headsPerEngine', { header: 'Heads', meta: { align: 'right', mono: true, wideOnly: true } }),
      col.display({
        id: 'warranty',
        header: 'Warranty',
        meta: { nowrap: true },
        cell: (c) => warrantyLabel(c.row.original),
      }),
      col.display({
        id: 'actions',
        header: () => <span className="sr-only">Actions</span>,
        meta: { nowrap: true },
        cell: (c) => {
          const f = c.row.original;
          return (
            <span className="inline-flex items-center gap-1.5">
              <Button size="sm" aria-label={`Edit ${f.code}`} onClick={() => setOpen({ kind: 'edit', family: f })}>
                Edit
              </Button>
              <Link
                to={auditHref({ entity: 'engine_family', entityId: f.id })}
                className="px-1.5 text-sm text-accent underline-offset-4 hover:underline"
                aria-label={`History of ${f.code}`}
              >
                History
              </Link>
            </span>
          );
        },
      }),
    ],
    [decimals],
  );

  // eslint-disable-next-line react-hooks/incompatible-library -- the table instance is rebuilt each render by design
  const table = useReactTable({
    data: rows,
    columns,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (f) => String(f.id),
  });

  return (
    <>
      <PageHeader
        title="Engine families"
        description="The engines this plant remanufactures. Routes, the spec book and warranty terms hang off each family."
        actions={
          <Button variant="primary" icon="plus" onClick={() => setOpen({ kind: 'add' })}>
            Add engine family
          </Button>
        }
      />
      <Card labelledBy="families-heading">
        <h2 id="families-heading" className="sr-only">
          List of engine families
        </h2>
        {families.error && (
          <div className="px-5 pt-4">
            <Notice tone="bad" live="alert">
              {families.error.message}
            </Notice>
          </div>
        )}
        <DataTable
          table={table}
          caption="Engine families"
          empty="No engine families yet. Add the first one."
          muted={(f) => !f.active}
        />
        <CardFooter>
          <p className="text-sm text-ink-soft">
            {plural(rows.length, 'engine family', 'engine families')}. Displacement is worked out from bore, stroke and
            cylinders.
          </p>
        </CardFooter>
      </Card>
      {open && <FamilyDialog family={open.kind === 'edit' ? open.family : null} onClose={() => setOpen(null)} />}
    </>
  );
}
