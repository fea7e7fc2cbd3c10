import type { QueryClient } from '@tanstack/react-query';
import { createColumnHelper, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import { Link, type LoaderFunctionArgs } from 'react-router';
import { useSignedIn } from '../../../api/auth/me';
import { defectCodesQueryOptions, useDefectCodes, type DefectCode } from '../../../api/defect-codes/defect-codes';
import { DataTable } from '../../../components/data-table';
import { PageHeader } from '../../../components/page-header';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { Card, CardFooter } from '../../../components/ui/card';
import { Notice } from '../../../components/ui/notice';
import { plural } from '../../../lib/format';
import { auditHref } from '../../../lib/paths';
import { requirePermission } from '../../../lib/session';
import { AddDefectCode, EditDefectCodeDialog, RetireDialog } from './defect-code-forms';

export const defectCodesLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'defects.manage');
    await queryClient.ensureQueryData(defectCodesQueryOptions());
    return null;
  };

type Open = { kind: 'edit' | 'retire'; code: DefectCode } | null;
const col = createColumnHelper<DefectCode>();

export function DefectCodesPage() {
  const me = useSignedIn();
  const codes = useDefectCodes();
  const [open, setOpen] = useState<Open>(null);
  const rows = codes.data ?? [];
  const active = rows.filter((d) => d.active).length;
  const canAudit = me?.can('audit.read') ?? false;

  const columns = useMemo(
    () => [
      col.accessor('code', {
        header: 'Code',
        meta: { mono: true, nowrap: true },
        cell: (c) => <span className="font-medium">{c.getValue()}</span>,
      }),
      col.accessor('description', { header: 'Description' }),
      col.accessor('active', {
        header: 'State',
        meta: { nowrap: true },
        cell: (c) => (c.getValue() ? <Badge tone="ok">Active</Badge> : <Badge tone="off">Retired</Badge>),
      }),
      col.display({
        id: 'actions',
        header: () => <span className="sr-only">Actions</span>,
        meta: { nowrap: true },
        cell: (c) => {
          const d = c.row.original;
          return (
            <span className="inline-flex items-center gap-1.5">
              <Button size="sm" aria-label={`Edit ${d.code}`} onClick={() => setOpen({ kind: 'edit', code: d })}>
                Edit
              </Button>
              <Button
                size="sm"
                aria-label={d.active ? `Retire ${d.code}` : `Bring back ${d.code}`}
                onClick={() => setOpen({ kind: 'retire', code: d })}
              >
                {d.active ? 'Retire' : 'Bring back'}
              </Button>
              {canAudit && (
                <Link
                  to={auditHref({ entity: 'defect_code', entityId: d.code })}
                  className="px-1.5 text-sm text-accent underline-offset-4 hover:underline"
                  aria-label={`History of ${d.code}`}
                >
                  History
                </Link>
              )}
            </span>
          );
        },
      }),
    ],
    [canAudit],
  );

  // eslint-disable-next-line react-hooks/incompatible-library -- the table instance is rebuilt each render by design
  const table = useReactTable({
    data: rows,
    columns,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (d) => d.code,
  });
  const close = () => setOpen(null);

  return (
    <>
      <PageHeader
        title="Defect codes"
        description="The codes people choose from when they raise a concern. A code is never deleted, because NCRs name it: retire one that is no longer wanted, and bring it back if it is."
      />
      <div className="flex flex-col gap-5">
        <AddDefectCode />
        <Card labelledBy="codes-heading">
          <h2 id="codes-heading" className="sr-only">
            List of defect codes
          </h2>
          {codes.error && (
            <div className="px-5 pt-4">
              <Notice tone="bad" live="alert">
                {codes.error.message}
              </Notice>
            </div>
          )}
          <DataTable
            table={table}
            caption="Defect codes"
            empty="No defect codes yet. Add the first one above."
            muted={(d) => !d.active}
          />
          <CardFooter>
            <p className="text-sm text-ink-soft" aria-live="polite">
              {plural(rows.length, 'code')}, {active} active
            </p>
          </CardFooter>
        </Card>
      </div>
      {open?.kind === 'edit' && <EditDefectCodeDialog code={open.code} onClose={close} />}
      {open?.kind === 'retire' && <RetireDialog code={open.code} onClose={close} />}
    </>
  );
}
