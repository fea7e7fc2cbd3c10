import { useId, useState, type ReactNode } from 'react';
import { Button } from '../../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../../components/ui/card';
import { Table, TBody, TD, TH, THead, TR } from '../../../components/ui/table';
import { downloadCsv, toCsv } from '../../../lib/csv';

export type Column<T> = { header: string; value: (row: T) => string | number | null; align?: 'left' | 'right' };

/**
 * A chart and its numbers: the table behind the picture is one click away, and the same rows go
 * out as CSV. The chart itself is passed in (loaded on demand), the table is plain HTML.
 */
export function ChartCard<T>({
  title,
  description,
  chart,
  rows,
  columns,
  filename,
}: {
  title: string;
  description?: ReactNode;
  chart: ReactNode;
  rows: T[];
  columns: Column<T>[];
  filename: string;
}) {
  const [numbers, setNumbers] = useState(false);
  const id = useId();
  return (
    <Card labelledBy={`${id}-title`}>
      <CardHeader
        id={`${id}-title`}
        title={title}
        description={description}
        actions={
          <>
            <Button
              size="sm"
              aria-expanded={numbers}
              aria-controls={`${id}-numbers`}
              onClick={() => setNumbers((n) => !n)}
            >
              {numbers ? 'Hide the numbers' : 'Show the numbers'}
            </Button>
            <Button
              size="sm"
              icon="download"
              onClick={() =>
                downloadCsv(
                  filename,
                  toCsv(
                    rows,
                    columns.map((c) => ({ header: c.header, value: c.value })),
                  ),
                )
              }
            >
              Export CSV
            </Button>
          </>
        }
      />
      <CardBody>
        {chart}
        {numbers && (
          <div id={`${id}-numbers`} className="mt-4 max-h-96 overflow-auto rounded-control border border-rule">
            <Table caption={`${title}: the numbers`}>
              <THead>
                <TR>
                  {columns.map((c) => (
                    <TH key={c.header} align={c.align}>
                      {c.header}
                    </TH>
                  ))}
                </TR>
              </THead>
              <TBody>
                {rows.map((r, i) => (
                  <TR key={i}>
                    {columns.map((c) => (
                      <TD key={c.header} align={c.align} mono={c.align === 'right'}>
                        {c.value(r) ?? '—'}
                      </TD>
                    ))}
                  </TR>
                ))}
              </TBody>
            </Table>
          </div>
        )}
      </CardBody>
    </Card>
  );
}
