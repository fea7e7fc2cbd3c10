import { flexRender, type RowData, type Table as TanTable } from '@tanstack/react-table';
import { Fragment, type ReactNode } from 'react';
import { EmptyRow, Table, TableFrame, TBody, TD, TH, THead, TR, type Align } from './ui/table';

declare module '@tanstack/react-table' {
  // eslint-disable-next-line @typescript-eslint/no-unused-vars
  interface ColumnMeta<TData extends RowData, TValue> {
    align?: Align;
    mono?: boolean;
    nowrap?: boolean;
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
                <TH key={h.id} align={h.column.columnDef.meta?.align}>
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
                      <TD key={cell.id} align={meta?.align} mono={meta?.mono} nowrap={meta?.nowrap}>
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
