import { NCR_SORTS, NCR_STATES, SEVERITIES } from '../../../shared/schemas/ncr';
import type { NcrFilter } from '../../api/ncrs/list-ncrs';

export const NCR_PAGE_SIZE = 25;

/** In the address, `state` absent means the open NCRs (the usual question) and `all` means every state. */
export const ALL_STATES = 'all';

const oneOf = <T extends string>(list: readonly T[], v: string | null): T | undefined =>
  v !== null && (list as readonly string[]).includes(v) ? (v as T) : undefined;
const positiveInt = (v: string | null) => {
  const n = Number(v);
  return v && Number.isInteger(n) && n > 0 ? n : undefined;
};

/** The list's filters, sort and page live in the address; anything malformed there is left out. */
export function ncrFilterFrom(params: URLSearchParams): NcrFilter {
  const filter: NcrFilter = {
    page: positiveInt(params.get('page')) ?? 1,
    pageSize: NCR_PAGE_SIZE,
    sort: oneOf(NCR_SORTS, params.get('sort')) ?? 'raised',
    dir: params.get('dir') === 'asc' ? 'asc' : 'desc',
  };
  const state = params.get('state');
  if (state !== ALL_STATES) filter.state = oneOf([...NCR_STATES, 'open'] as const, state) ?? 'open';
  const severity = oneOf(SEVERITIES, params.get('severity'));
  if (severity) filter.severity = severity;
  const defect = params.get('defect')?.trim().toUpperCase();
  if (defect && /^[A-Z0-9_-]{1,20}$/.test(defect)) filter.defect = defect;
  const family = positiveInt(params.get('family'));
  if (family) filter.family = family;
  const stage = params.get('stage')?.trim();
  if (stage && stage.length <= 40) filter.stage = stage;
  const older = params.get('olderThanDays');
  if (older && /^\d{1,4}$/.test(older) && Number(older) <= 3650) filter.olderThanDays = Number(older);
  const assignee = params.get('assignee');
  if (assignee === 'none') filter.assignee = 'none';
  else if (positiveInt(assignee)) filter.assignee = positiveInt(assignee);
  const q = params.get('q')?.trim();
  if (q) filter.q = q.slice(0, 60);
  return filter;
}
