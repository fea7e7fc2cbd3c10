import { create } from 'content-disposition';

/**
 * A Content-Disposition value for a file name, built by the `content-disposition` package (RFC 6266,
 * with an RFC 8187 `filename*` and an ASCII fallback when the name is not plain ASCII). Never built
 * by hand: a name outside Latin-1 or with a line break in it cannot go into a header as it is.
 */
export const fileDisposition = (fileName: string, type: 'inline' | 'attachment' = 'attachment') =>
  create(fileName, { type });
