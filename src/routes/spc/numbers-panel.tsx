import { useId, useState } from 'react';
import { Button } from '../../components/ui/button';
import { Table, TableFrame, TBody, TD, TH, THead, TR, type Align } from '../../components/ui/table';
import { downloadCsv, toCsv } from '../../lib/csv';

export type NumberColumn<T> = {
  header: string;
  /** As shown in the table. */
  text: (row: T) => string;
  /** As written to the CSV (full precision); the shown text when left out. */
  csv?: (row: T) => unknown;
  align?: Align;
  mono?: boolean;
};

/** The rows as CSV at full precision. */
export function CsvButton<T>({ rows, columns, filename }: { rows: T[]; columns: NumberColumn<T>[]; filename: string }) {
  return (
    <Button
      icon="download"
      disabled={!rows.length}
      onClick={() =>
        downloadCsv(
          filename,
          toCsv(
            rows,
            columns.map((c) => ({ header: c.header, value: c.csv ?? c.text })),
          ),
        )
      }
    >
      Download CSV
    </Button>
  );
}

/**
 * A chart's numbers one click away: a table with a sticky header under the chart, and the same rows
 * as CSV at full precision.
 */
export function NumbersPanel<T>({
  title,
  rows,
  columns,
  filename,
  open: initiallyOpen = false,
}: {
  title: string;
  rows: T[];
  columns: NumberColumn<T>[];
  filename: string;
  open?: boolean;
}) {
  const [open, setOpen] = useState(initiallyOpen);
  const id = useId();
  return (
    <div className="flex flex-col gap-2">
      <div data-density="floor" className="flex flex-wrap items-center gap-2">
        <Button
          icon={open ? 'chevronUp' : 'chevronDown'}
          aria-expanded={open}
          aria-controls={id}
          onClick={() => setOpen(!open)}
        >
          {open ? `Hide the numbers` : `Show the numbers`}
        </Button>
        <CsvButton rows={rows} columns={columns} filename={filename} />
        <span className="text-sm text-ink-soft">
          {rows.length} row{rows.length === 1 ? '' : 's'}
        </span>
      </div>
      {open && (
        <div id={id} className="rounded-control border border-rule">
          <TableFrame label={title}>
            <Table caption={title}>
              <THead>
                <tr>
                  {columns.map((c) => (
                    <TH key={c.header} align={c.align}>
                      {c.header}
                    </TH>
                  ))}
                </tr>
              </THead>
              <TBody>
                {rows.map((r, i) => (
                  <TR key={i}>
                    {columns.map((c) => (
                      <TD key={c.header} align={c.align} mono={c.mono}>
                        {c.text(r)}
                      </TD>
                    ))}
                  </TR>
                ))}
              </TBody>
            </Table>
          </TableFrame>
        </div>
      )}
    </div>
  );
}
