import Papa from 'papaparse';

/**
 * Every CSV file Coretrail writes, on the server and in the browser, comes from here, so they all
 * follow the same three rules:
 *
 * - RFC 4180 fields: comma-separated, CRLF between records and after the last one, a field quoted
 *   only when it holds a comma, a quote mark, a line break or a space at either end, inner quote
 *   marks doubled (papaparse's `unparse`).
 * - Formula neutralising: a text cell that starts with = + - @ tab or CR would be run as a formula
 *   by a spreadsheet, so it gets a leading apostrophe (OWASP, "CSV Injection"). Numbers are written
 *   as numbers: −0.002 is a reading, not a formula.
 * - A UTF-8 byte-order mark first, so a spreadsheet opens names like "Müller" or "TARN-6 — …" as
 *   UTF-8 rather than in the machine's old code page.
 */

export const BYTE_ORDER_MARK = '\ufeff';

// Papa's own `escapeFormulae: true` pattern is /^[=+\-@\t\r].*$/, which misses a formula followed by
// a line break ('.' stops at it); only the first character matters
const FORMULA_START = /^[=+\-@\t\r]/;

/** One cell as text for the writer: objects as JSON, dates as ISO 8601, nothing as an empty field. */
function plain(v: unknown): string | number | boolean | null {
  if (v === null || v === undefined) return null;
  if (typeof v === 'number' || typeof v === 'boolean' || typeof v === 'string') return v;
  if (typeof v === 'bigint') return v.toString();
  if (v instanceof Date) return Number.isNaN(v.getTime()) ? null : v.toISOString();
  return JSON.stringify(v);
}

/** A whole CSV document: the byte-order mark, a header record, then one record per row. */
export function csvDocument(header: readonly string[], rows: readonly (readonly unknown[])[]): string {
  // one list of records, header first: Papa's `fields` form writes a stray line for an empty list
  const records = [[...header], ...rows.map((r) => r.map(plain))];
  const body = Papa.unparse(records, { newline: '\r\n', escapeFormulae: FORMULA_START });
  return `${BYTE_ORDER_MARK}${body}\r\n`;
}

/** The same document from records and named columns, for lists whose rows are objects. */
export function csvOf<T>(rows: readonly T[], columns: readonly { header: string; value: (row: T) => unknown }[]) {
  return csvDocument(
    columns.map((c) => c.header),
    rows.map((row) => columns.map((c) => c.value(row))),
  );
}
