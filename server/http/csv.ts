import type { Response } from 'express';
import { fileDisposition } from './files.js';

/** A spreadsheet cell that starts with = + - @ could run as a formula: quote it as text. */
export function csvCell(v: unknown): string {
  let s = v === null || v === undefined ? '' : String(v);
  if (/^[=+\-@\t\r]/.test(s)) s = `'${s}`;
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** A whole CSV document: a header line, then one line per row, CRLF line ends (RFC 4180). */
export const csvDocument = (header: string[], rows: unknown[][]) =>
  `${[header.join(','), ...rows.map((r) => r.map(csvCell).join(','))].join('\r\n')}\r\n`;

/** Sends a CSV as a download. */
export function sendCsv(res: Response, filename: string, body: string) {
  res.setHeader('Content-Type', 'text/csv; charset=utf-8');
  res.setHeader('Content-Disposition', fileDisposition(filename));
  res.send(body);
}
