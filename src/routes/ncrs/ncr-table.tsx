import { createColumnHelper, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { useMemo } from 'react';
import { Link } from 'react-router';
import type { NcrRow } from '../../api/ncrs/types';
import { DataTable, SortButton } from '../../components/data-table';
import { serverSorting, type ListSort } from '../../components/filtered-list';
import { formatWhen } from '../../lib/format';
import { useDefectCodes } from '../../api/defect-codes/defect-codes';
import { Icon } from '../../components/ui/icon';
import { itemHref, lotHref, ncrHref } from '../../lib/paths';
import { defectDescription } from './defect-options';
import { dispositionWord, NcrStateBadge, SeverityMark } from './ncr-badges';

const col = createColumnHelper<NcrRow>();
const linkClass = 'font-semibold text-accent underline-offset-4 hover:underline';
const none = <span className="text-ink-soft">—</span>;

/** A critical use-as-is signed once is not in effect yet: say so wherever the disposition is shown. */
function DispositionText({ row, quiet = false }: { row: NcrRow; quiet?: boolean }) {
  if (row.awaitingSecondSignature) {
    return (
      <span className="inline-flex items-start gap-1 text-wait">
        <Icon name="wait" size={15} className="mt-0.5 shrink-0" />
        <span>Use as is — waiting for second signature</span>
      </span>
    );
  }
  const d = dispositionWord(row.disposition);
  return d ? <span className={quiet ? 'text-ink-soft' : ''}>{d}</span> : null;
}

type NcrTableProps = {
  rows: NcrRow[];
  /** The lot page is part of the trail, which not every role reads. */
  canOpenLot: boolean;
  busy: boolean;
  empty?: string;
  sort: ListSort;
};

/** Sorting and paging are the server's; the table shows which way it is sorted and asks for more. */
export function NcrTable({ rows, canOpenLot, busy, empty, sort }: NcrTableProps) {
  const defects = useDefectCodes().data;
  const columns = useMemo(
    () => [
      col.accessor('number', {
        header: ({ column }) => <SortButton column={column}>NCR</SortButton>,
        cell: (c) => (
          <span className="flex flex-col leading-snug xl:w-48">
            <Link to={ncrHref(c.getValue())} className={`font-mono ${linkClass}`}>
              {c.getValue()}
            </Link>
            <span className="hidden truncate text-sm text-ink-soft xl:block" title={c.row.original.description}>
              {c.row.original.description}
            </span>
          </span>
        ),
      }),
      col.accessor('state', {
        header: ({ column }) => <SortButton column={column}>State</SortButton>,
        cell: (c) => (
          <span className="flex flex-col items-start gap-0.5">
            <NcrStateBadge state={c.getValue()} />
            {/* the disposition has its own column on a wide screen */}
            <span className="max-w-44 text-sm xl:hidden">
              <DispositionText row={c.row.original} quiet />
            </span>
          </span>
        ),
      }),
      col.accessor('severity', {
        header: ({ column }) => <SortButton column={column}>Severity</SortButton>,
        cell: (c) => <SeverityMark severity={c.getValue()} />,
      }),
      col.accessor('serial', {
        header: ({ column }) => <SortButton column={column}>Serial</SortButton>,
        meta: { nowrap: true },
        cell: (c) => {
          const serial = c.getValue();
          const lot = c.row.original.lotCode;
          if (!serial && lot) {
            const code = <span className="font-mono">{lot}</span>;
            return canOpenLot ? (
              <Link to={lotHref(lot)} className={linkClass}>
                Lot {code}
              </Link>
            ) : (
              <span className="font-medium">Lot {code}</span>
            );
          }
          if (!serial) return none;
          return (
            <span className="flex flex-col leading-snug">
              <Link to={itemHref(serial)} className={`font-mono ${linkClass}`}>
                {serial}
              </Link>
              <span className="font-mono text-sm text-ink-soft xl:hidden">{c.row.original.familyCode}</span>
            </span>
          );
        },
      }),
      col.accessor('familyCode', {
        id: 'family',
        header: 'Family',
        enableSorting: false,
        meta: { mono: true, nowrap: true, wideOnly: true },
        cell: (c) => c.getValue() ?? none,
      }),
      col.accessor('stageName', {
        id: 'stage',
        header: 'Stage',
        enableSorting: false,
        cell: (c) => <span className="block min-w-28">{c.getValue() ?? <span className="text-ink-soft">—</span>}</span>,
      }),
      col.accessor('defectCode', {
        id: 'defect',
        header: 'Defect',
        enableSorting: false,
        meta: { mono: true, nowrap: true },
        cell: (c) => {
          const code = c.getValue();
          return code ? <abbr title={defectDescription(defects, code) ?? code}>{code}</abbr> : none;
        },
      }),
      col.accessor('disposition', {
        header: 'Disposition',
        enableSorting: false,
        meta: { wideOnly: true },
        cell: (c) => (
          <span className="block max-w-44">
            {c.row.original.disposition || c.row.original.awaitingSecondSignature ? (
              <DispositionText row={c.row.original} />
            ) : (
              none
            )}
          </span>
        ),
      }),
      col.accessor('raisedAt', {
        id: 'raised',
        header: ({ column }) => <SortButton column={column}>Raised</SortButton>,
        meta: { nowrap: true },
        cell: (c) => (
          <span className="flex flex-col leading-snug">
            <time dateTime={c.getValue()} title={formatWhen(c.getValue())} className="font-mono text-[0.875rem]">
              {formatWhen(c.getValue()).slice(0, 10)}
            </time>
            <span className="text-sm text-ink-soft">{c.row.original.raisedBy}</span>
          </span>
        ),
      }),
      col.accessor('ageDays', {
        id: 'age',
        header: 'Days old',
        enableSorting: false,
        meta: { align: 'right', mono: true, wideOnly: true },
      }),
      col.accessor('assignee', {
        header: 'Assignee',
        enableSorting: false,
        cell: (c) => c.getValue() ?? <span className="text-ink-soft">Nobody</span>,
      }),
    ],
    [canOpenLot, defects],
  );

  // eslint-disable-next-line react-hooks/incompatible-library -- the table instance is rebuilt each render by design
  const table = useReactTable({
    data: rows,
    columns,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (r) => r.number,
    ...serverSorting(sort),
  });

  return <DataTable table={table} caption="NCRs" empty={empty ?? 'No NCRs match these filters.'} busy={busy} />;
}
