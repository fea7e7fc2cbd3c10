/** RFC 4180 quoting: every field quoted, inner quotes doubled, CRLF between rows. */
function field(v: unknown): string {
  const s = v === null || v === undefined ? '' : typeof v === 'object' ? JSON.stringify(v) : String(v);
  // a leading = + - @ would be run as a formula by a spreadsheet; a quote mark keeps it text
  const safe = /^[=+\-@\t\r]/.test(s) ? `'${s}` : s;
  return `"${safe.replace(/"/g, '""')}"`;
}

export function toCsv<T>(rows: T[], columns: { header: string; value: (row: T) => unknown }[]): string {
  const lines = [columns.map((c) => field(c.header)).join(',')];
  for (const row of rows) lines.push(columns.map((c) => field(c.value(row))).join(','));
  return `${lines.join('\r\n')}\r\n`;
}

export function downloadCsv(filename: string, csv: string): void {
  const url = URL.createObjectURL(new Blob(['\ufeff', csv], { type: 'text/csv;charset=utf-8' }));
  const a = document.createElement('a');
  a.href = url;
  a.download = filename;
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

/** Walks every page of a paged list (the API caps a page at 200) for an export of the whole filter. */
export async function fetchAllPages<T>(
  fetchPage: (page: number, pageSize: number) => Promise<{ rows: T[]; total: number }>,
): Promise<T[]> {
  const pageSize = 200;
  const all: T[] = [];
  for (let page = 1; ; page++) {
    const { rows, total } = await fetchPage(page, pageSize);
    all.push(...rows);
    if (rows.length === 0 || all.length >= total) return all;
  }
}
