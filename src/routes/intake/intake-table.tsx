import { createColumnHelper, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { useMemo } from 'react';
import { Link } from 'react-router';
import { GRADE_LABELS, type CoreSummary } from '../../../shared/schemas/intake';
import { DataTable, SortButton } from '../../components/data-table';
import { serverSorting, type ListSort } from '../../components/filtered-list';
import { StatusBadge } from '../../components/item-status';
import { gradeWord, SOURCE_LABELS } from '../../lib/intake-labels';
import { coreHref } from '../../lib/paths';

const col = createColumnHelper<CoreSummary>();
// the column heading already says "Core credit"
const CREDIT_SHORT = { full: 'Full', partial: 'Partial', none: 'None' } as const;

type IntakeTableProps = {
  rows: CoreSummary[];
  busy: boolean;
  /** What an empty table says; by default that the filters match nothing. */
  empty?: string;
  sort: ListSort;
};

/** Sorting is the server's (the log is paged there); the table only shows which way and asks for more. */
export function IntakeTable({ rows, busy, sort, empty }: IntakeTableProps) {
  const columns = useMemo(
    () => [
      col.accessor('serial', {
        header: ({ column }) => <SortButton column={column}>Serial</SortButton>,
        meta: { mono: true, nowrap: true },
        cell: (c) => (
          <Link
            to={coreHref(c.getValue())}
            className="inline-flex items-center font-semibold text-accent underline-offset-4 hover:underline floor:min-h-12"
          >
            {c.getValue()}
          </Link>
        ),
      }),
      col.accessor('receivedOn', {
        header: ({ column }) => <SortButton column={column}>Received</SortButton>,
        meta: { nowrap: true },
        cell: (c) => (
          <span className="flex flex-col leading-snug">
            <span className="font-mono">{c.getValue()}</span>
            <span className="text-sm text-ink-soft">{c.row.original.receivedBy}</span>
          </span>
        ),
      }),
      col.accessor('familyCode', {
        id: 'family',
        header: ({ column }) => <SortButton column={column}>Family</SortButton>,
        meta: { mono: true, nowrap: true },
      }),
      col.accessor('castingNumber', {
        header: ({ column }) => <SortButton column={column}>Casting / ID no.</SortButton>,
        meta: { mono: true, nowrap: true },
        cell: (c) => (
          <span className="flex flex-col leading-snug">
            <span>{c.getValue()}</span>
            <span className="text-ink-soft">{c.row.original.idNumber ?? '—'}</span>
          </span>
        ),
      }),
      col.accessor('source', {
        header: 'Source',
        enableSorting: false,
        cell: (c) => (
          <span className="flex min-w-36 flex-col leading-snug">
            <span>{SOURCE_LABELS[c.getValue()]}</span>
            <span className="text-sm text-ink-soft">{c.row.original.partyName ?? '—'}</span>
            {c.row.original.sourceReference && (
              <span className="font-mono text-sm text-ink-soft">{c.row.original.sourceReference}</span>
            )}
          </span>
        ),
      }),
      col.accessor('grade', {
        header: ({ column }) => <SortButton column={column}>Grade</SortButton>,
        cell: (c) => {
          const g = c.getValue();
          return g ? <span title={GRADE_LABELS[g]}>{gradeWord(GRADE_LABELS[g])}</span> : '—';
        },
      }),
      col.accessor('creditDecision', {
        header: 'Core credit',
        enableSorting: false,
        // on the core's own page too; the tablet view keeps the columns the dock sorts by
        meta: { nowrap: true, wideOnly: true },
        cell: (c) => {
          const d = c.getValue();
          const settled = c.row.original.settledCredit;
          if (!d) return <span className="text-ink-soft">—</span>;
          // the dock's decision stays; the one settled after teardown sits beside it
          return settled ? (
            <span className="flex flex-col leading-snug" title={c.row.original.settledReason ?? undefined}>
              <span className="text-sm text-ink-soft">{CREDIT_SHORT[d]} at the dock</span>
              <span>
                {CREDIT_SHORT[settled]} <span className="text-sm text-ink-soft">settled</span>
              </span>
            </span>
          ) : (
            CREDIT_SHORT[d]
          );
        },
      }),
      // the status says "Rejected at intake" for a rejected core, so no separate accepted column
      col.accessor('status', {
        header: 'Status',
        enableSorting: false,
        cell: (c) => <StatusBadge status={c.getValue()} />,
      }),
    ],
    [],
  );

  // eslint-disable-next-line react-hooks/incompatible-library -- the table instance is rebuilt each render by design
  const table = useReactTable({
    data: rows,
    columns,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (r) => r.serial,
    ...serverSorting(sort),
  });

  return <DataTable table={table} caption="Intake log" empty={empty ?? 'No cores match these filters.'} busy={busy} />;
}
