/**
 * Reading a list's filters back from the address. What the address holds may be an old bookmark or
 * a hand-edited link: anything malformed is left out here, so the query sent is always one the
 * shared schema accepts.
 */

export const oneOf = <T extends string>(list: readonly T[], v: string | null): T | undefined =>
  v !== null && (list as readonly string[]).includes(v) ? (v as T) : undefined;

export const positiveInt = (v: string | null): number | undefined => {
  const n = Number(v);
  return v && Number.isInteger(n) && n > 0 ? n : undefined;
};

export const isoDay = (v: string | null): string | undefined => (v && /^\d{4}-\d{2}-\d{2}$/.test(v) ? v : undefined);

export const pageFrom = (params: URLSearchParams) => positiveInt(params.get('page')) ?? 1;

export const dirFrom = (params: URLSearchParams): 'asc' | 'desc' => (params.get('dir') === 'asc' ? 'asc' : 'desc');

/** Only the entries that are set, so an absent filter is absent from the query key and the address. */
export const defined = <T extends object>(o: T): T =>
  Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined && v !== '')) as T;

/**
 * A list query as the client sends it: the shared schema's input (`z.input`), with the keys the
 * server would default (page, page size, sort) always set by the client.
 */
export type Filled<F, K extends keyof F> = F & { [P in K]-?: Exclude<F[P], undefined> };

/** The same filters as a CSV export's address: every filter and the sort, without the paging. */
export function exportHref(path: string, filter: { page?: unknown; pageSize?: unknown }): string {
  const { page: _p, pageSize: _s, ...rest } = filter;
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(rest)) if (v !== undefined) q.set(k, String(v));
  return `${path}?${q.toString()}`;
}
