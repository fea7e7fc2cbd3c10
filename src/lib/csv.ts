/** The browser's exports write CSV with the same writer as the server's (quoting, formulas, byte-order mark). */
export { csvOf as toCsv } from '../../shared/csv';

/** Offers a CSV document (already with its byte-order mark) as a file to save. */
export function downloadCsv(filename: string, csv: string): void {
  const url = URL.createObjectURL(new Blob([csv], { type: 'text/csv;charset=utf-8' }));
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
