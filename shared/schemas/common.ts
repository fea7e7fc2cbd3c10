import { z } from 'zod';

/** Route parameter `:id` for records keyed by integer ids. */
export const idParam = z.strictObject({ id: z.coerce.number().int().positive() });

/** Paging for list endpoints: `?page=1&pageSize=50`. */
export const paging = {
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
};

export type Paged<T> = { rows: T[]; total: number; page: number; pageSize: number };

/** The body of every error reply. */
export type ApiError = {
  error: { code: string; message: string; fields?: Record<string, string>; requestId?: string };
};
