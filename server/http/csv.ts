import type { Response } from 'express';
import { fileDisposition } from './files.js';

/** Sends a CSV document (written by shared/csv.ts, byte-order mark and all) as a download. */
export function sendCsv(res: Response, filename: string, body: string) {
  res.setHeader('Content-Type', 'text/csv; charset=utf-8');
  res.setHeader('Content-Disposition', fileDisposition(filename));
  res.send(body);
}
