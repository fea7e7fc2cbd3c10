import { parseSerial } from '../../shared/domain/serial';
import { ApiError } from './http';

/** The printed form of a serial taken from an address, so one item has one cache entry however it was typed. */
export function canonicalSerial(raw: string | null | undefined): string {
  const p = parseSerial(raw ?? '');
  return p.ok ? p.serial : (raw ?? '');
}

/**
 * For loaders of /cores/:serial and /items/:serial: a serial that cannot exist is refused here, in
 * the server's own words, without asking the server.
 */
export function requireSerial(raw: string | undefined): string {
  const p = parseSerial(raw ?? '');
  if (!p.ok) throw new ApiError(400, { code: 'invalid', message: p.reason });
  return p.serial;
}
