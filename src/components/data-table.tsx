import { flexRender, type Column, type RowData, type Table as TanTable } from '@tanstack/react-table';
import { Fragment, type ReactNode } from 'react';
import { Icon } from './ui/icon';
import { EmptyRow, Table, TableFrame, TBody, TD, TH, THead, TR, type Align } from './ui/table';

declare module '@tanstack/react-table' {
  // eslint-disable-next-line @typescript-eslint/no-unused-vars
  interface ColumnMeta<TData extends RowData, TValue> {
    align?: Align;
    mono?: boolean;
    nowrap?: boolean;
    wideOnly?: boolean;
  }
}

type DataTableProps<T> = {
  table: TanTable<T>;
  caption: string;
  empty: ReactNode;
  /** Rows whose record is no longer in use read quieter (still in full contrast). */
  muted?: (row: T) => boolean;
  /** A second row under a row, e.g. an opened before/after view. */
  expanded?: (row: T) => ReactNode | null;
  /** The rows shown are the previous page's while the next one loads. */
  busy?: boolean;
};

/** Renders a TanStack table with Coretrail's primitives: sticky head, right-aligned numbers, mono codes. */
export function DataTable<T>({ table, caption, empty, muted, expanded, busy = false }: DataTableProps<T>) {
  const columns = table.getVisibleLeafColumns().length;
  const rows = table.getRowModel().rows;
  return (
    <TableFrame label={caption} busy={busy}>
      <Table caption={caption}>
        <THead>
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id}>
              {group.headers.map((h) => (
                <TH
                  key={h.id}
                  align={h.column.columnDef.meta?.align}
                  wideOnly={h.column.columnDef.meta?.wideOnly}
                  aria-sort={ariaSort(h.column)}
                >
                  {h.isPlaceholder ? null : flexRender(h.column.columnDef.header, h.getContext())}
                </TH>
              ))}
            </tr>
          ))}
        </THead>
        <TBody>
          {rows.length === 0 && <EmptyRow colSpan={columns}>{empty}</EmptyRow>}
          {rows.map((row) => {
            const extra = expanded?.(row.original) ?? null;
            return (
              <Fragment key={row.id}>
                <TR muted={muted?.(row.original)}>
                  {row.getVisibleCells().map((cell) => {
                    const meta = cell.column.columnDef.meta;
                    return (
                      <TD
                        key={cell.id}
                        align={meta?.align}
                        mono={meta?.mono}
                        nowrap={meta?.nowrap}
                        wideOnly={meta?.wideOnly}
                      >
                        {flexRender(cell.column.columnDef.cell, cell.getContext())}
                      </TD>
                    );
                  })}
                </TR>
                {extra && (
                  <tr>
                    <td colSpan={columns} className="border-b border-rule bg-sunk px-5 py-3">
                      {extra}
                    </td>
                  </tr>
                )}
              </Fragment>
            );
          })}
        </TBody>
      </Table>
    </TableFrame>
  );
}

function ariaSort<T>(column: Column<T, unknown>) {
  if (!column.getCanSort()) return undefined;
  const sorted = column.getIsSorted();
  return sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : 'none';
}

/** A column heading that sorts the list; its mark says which way, the heading's aria-sort says it aloud. */
export function SortButton<T>({ column, children }: { column: Column<T, unknown>; children: ReactNode }) {
  const sorted = column.getIsSorted();
  return (
    <button
      type="button"
      onClick={column.getToggleSortingHandler()}
      className={`-mx-1 inline-flex min-h-8 items-center gap-1 rounded-control px-1 uppercase tracking-wide hover:bg-ground-deep/40 hover:text-ink floor:min-h-11 ${sorted ? 'text-ink' : ''}`}
    >
      {children}
      <Icon name={sorted === 'asc' ? 'chevronUp' : sorted === 'desc' ? 'chevronDown' : 'sortable'} size={15} />
    </button>
  );
}
