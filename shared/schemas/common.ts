import type { ErrorCode } from '../errors.js';
import { z } from 'zod';

/**
 * Values PostgreSQL would refuse or quietly change are refused here, before any statement runs:
 * text with a NUL byte (refused by text and JSONB columns) or half of a surrogate pair (stored as
 * U+FFFD, so silently changed), dates outside 1900–2100, integers beyond an `integer` column and
 * decimals beyond a `numeric(p, s)` column. Every shared schema builds on these.
 */
export const INT4_MAX = 2_147_483_647;
export const FIRST_YEAR = 1900;
export const LAST_YEAR = 2100;

// eslint-disable-next-line no-control-regex -- finding the NUL byte is the point
const UNSTORABLE = /\u0000|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;
export const isStorableText = (s: string) => !UNSTORABLE.test(s);
export const UNSTORABLE_TEXT =
  'This text holds a character that cannot be stored (a NUL byte or half of an emoji): type it again.';

/** Any text a person sends. */
export const text = (message?: string) => z.string(message).refine(isStorableText, UNSTORABLE_TEXT);

const YEAR_RANGE = `Use a date between ${FIRST_YEAR} and ${LAST_YEAR}.`;
const inYears = (iso: string) => {
  const year = Number(iso.slice(0, 4));
  return year >= FIRST_YEAR && year <= LAST_YEAR;
};

/** A calendar date, YYYY-MM-DD, within 1900–2100. */
export const isoDate = (message = 'Use a date like 2026-12-01.') => z.iso.date(message).refine(inYears, YEAR_RANGE);

/** A moment with its offset, within 1900–2100 (in UTC). */
export const isoDateTime = (message = 'Use a date and time like 2026-12-02T08:00:00Z.') =>
  z.iso.datetime({ offset: true, error: message }).refine((v) => {
    // refinements run even when the format check failed, so an unparseable value must not throw here
    const t = Date.parse(v);
    return Number.isFinite(t) && inYears(new Date(t).toISOString());
  }, YEAR_RANGE);

/** A whole number that fits PostgreSQL's `integer`. */
export const int4 = (message?: string) =>
  z
    .number(message)
    .int('Use a whole number.')
    .min(-INT4_MAX - 1, 'Too small.')
    .max(INT4_MAX, 'Too large.');

/** A record's id in a body. */
export const id = (message?: string) =>
  z
    .number(message)
    .int('Use a whole number.')
    .positive('Choose one from the list.')
    .max(INT4_MAX, 'No record has so large an id.');

/**
 * A record's id in a query string or a path. Its input is typed as the number the client means
 * (`z.input` of a query schema is the client's filter type); the string in the address is coerced.
 */
export const idText = () => z.coerce.number<number>().int().positive().max(INT4_MAX, 'No record has so large an id.');

/** A number that fits `numeric(precision, scale)` exactly: nothing rounded away, nothing overflowing. */
export const decimal = (precision: number, scale: number, message?: string) =>
  z
    .number(message)
    .refine((v) => Math.abs(v) < 10 ** (precision - scale), `Use a number under ${10 ** (precision - scale)}.`)
    .refine((v) => Number(v.toFixed(scale)) === v, `Use at most ${scale} decimal places.`);

/** Route parameter `:id` for records keyed by integer ids. */
export const idParam = z.strictObject({ id: idText() });

/** Paging for list endpoints: `?page=1&pageSize=50`. */
export const paging = {
  page: z.coerce.number<number>().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number<number>().int().min(1).max(200).default(50),
};

export type Paged<T> = { rows: T[]; total: number; page: number; pageSize: number };

/** The body of every error reply. */
/** Every error reply; `code` is from the one vocabulary (shared/errors.ts). */
export type ApiError = {
  error: { code: ErrorCode; message: string; fields?: Record<string, string>; requestId?: string };
};
