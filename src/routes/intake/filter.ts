import { GRADES, INTAKE_SORTS, SOURCES } from '../../../shared/schemas/intake';
import type { IntakeLogFilter } from '../../api/cores/intake-log';

export const INTAKE_PAGE_SIZE = 25;

const oneOf = <T extends string>(list: readonly T[], v: string | null): T | undefined =>
  v !== null && (list as readonly string[]).includes(v) ? (v as T) : undefined;
const isoDate = (v: string | null) => (v && /^\d{4}-\d{2}-\d{2}$/.test(v) ? v : undefined);

/** The log's filters, sort and page live in the address; anything malformed there is left out. */
export function intakeFilterFrom(params: URLSearchParams): IntakeLogFilter {
  const page = Number(params.get('page'));
  const family = Number(params.get('family'));
  const q = params.get('q')?.trim();
  const accepted = oneOf(['true', 'false'] as const, params.get('accepted'));
  const filter: IntakeLogFilter = {
    page: Number.isInteger(page) && page > 0 ? page : 1,
    pageSize: INTAKE_PAGE_SIZE,
    sort: oneOf(INTAKE_SORTS, params.get('sort')) ?? 'receivedOn',
    dir: params.get('dir') === 'asc' ? 'asc' : 'desc',
  };
  if (Number.isInteger(family) && family > 0) filter.family = family;
  const source = oneOf(SOURCES, params.get('source'));
  if (source) filter.source = source;
  const grade = oneOf(GRADES, params.get('grade'));
  if (grade) filter.grade = grade;
  if (accepted) filter.accepted = accepted;
  const from = isoDate(params.get('from'));
  if (from) filter.from = from;
  const to = isoDate(params.get('to'));
  if (to) filter.to = to;
  if (q) filter.q = q.slice(0, 40);
  return filter;
}

/** The same rows as CSV: every filter and the sort, without the paging. */
export function exportHref(filter: IntakeLogFilter): string {
  const { page: _p, pageSize: _s, ...rest } = filter;
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(rest)) if (v !== undefined) q.set(k, String(v));
  return `/api/cores/export.csv?${q.toString()}`;
}
