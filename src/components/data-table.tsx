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
    /** The column's name in the second line of a row, when its header is not plain text. */
    label?: string;
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

/**
 * Renders a TanStack table with Coretrail's primitives: sticky head, right-aligned numbers, mono
 * codes. Columns marked `wideOnly` sit in the row on a wide screen and on a second line under it
 * below 1280 px, so the table fits instead of scrolling sideways.
 */
export function DataTable<T>({ table, caption, empty, muted, expanded, busy = false }: DataTableProps<T>) {
  const leaves = table.getVisibleLeafColumns();
  const columns = leaves.length;
  // below 1280 px the wide-only columns leave the row and come back on a line of their own under it
  const folded = leaves.filter((c) => c.columnDef.meta?.wideOnly).map((c) => c.id);
  const narrowColumns = columns - folded.length;
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
            const cells = row.getVisibleCells();
            const foldedCells = cells.filter((c) => folded.includes(c.column.id));
            return (
              <Fragment key={row.id}>
                <TR muted={muted?.(row.original)}>
                  {cells.map((cell) => {
                    const meta = cell.column.columnDef.meta;
                    return (
                      <TD
                        key={cell.id}
                        align={meta?.align}
                        mono={meta?.mono}
                        nowrap={meta?.nowrap}
                        wideOnly={meta?.wideOnly}
                        className={foldedCells.length ? 'max-xl:border-b-0' : ''}
                      >
                        {flexRender(cell.column.columnDef.cell, cell.getContext())}
                      </TD>
                    );
                  })}
                </TR>
                {foldedCells.length > 0 && (
                  <tr className={`xl:hidden ${muted?.(row.original) ? 'text-ink-soft' : ''}`}>
                    <td colSpan={narrowColumns} className="border-b border-rule px-5 pb-2 text-sm">
                      <dl className="flex flex-wrap gap-x-6 gap-y-1">
                        {foldedCells.map((cell) => {
                          const meta = cell.column.columnDef.meta;
                          return (
                            <div key={cell.id} className="flex gap-1.5">
                              <dt className="text-ink-soft">{columnLabel(cell.column)}:</dt>
                              <dd className={meta?.mono ? 'font-mono' : ''}>
                                {flexRender(cell.column.columnDef.cell, cell.getContext())}
                              </dd>
                            </div>
                          );
                        })}
                      </dl>
                    </td>
                  </tr>
                )}
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

function columnLabel<T>(column: Column<T, unknown>): string {
  const header = column.columnDef.header;
  return column.columnDef.meta?.label ?? (typeof header === 'string' ? header : column.id);
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
      className={`-mx-1 inline-flex min-h-8 items-center gap-1 rounded-control px-1 uppercase tracking-wide hover:bg-ground-deep/40 hover:text-ink floor:min-h-12 ${sorted ? 'text-ink' : ''}`}
    >
      {children}
      <Icon name={sorted === 'asc' ? 'chevronUp' : sorted === 'desc' ? 'chevronDown' : 'sortable'} size={15} />
    </button>
  );
}
