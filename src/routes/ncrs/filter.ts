import { NCR_SORTS, NCR_STATES, SEVERITIES } from '../../../shared/schemas/ncr';
import type { NcrFilter } from '../../api/ncrs/list-ncrs';
import { defined, dirFrom, oneOf, pageFrom, positiveInt } from '../../lib/list-filter';

export const NCR_PAGE_SIZE = 25;

/** In the address, `state` absent means the open NCRs (the usual question) and `all` means every state. */
export const ALL_STATES = 'all';

/** The filters "Clear filters" empties. */
export const NCR_FILTERS = [
  'state',
  'severity',
  'defect',
  'family',
  'stage',
  'olderThanDays',
  'assignee',
  'q',
] as const;

function assigneeFrom(v: string | null): NcrFilter['assignee'] {
  return v === 'none' ? 'none' : positiveInt(v);
}

/** The list's filters, sort and page live in the address; anything malformed there is left out. */
export function ncrFilterFrom(params: URLSearchParams): NcrFilter {
  const state = params.get('state');
  const defect = params.get('defect')?.trim().toUpperCase();
  const stage = params.get('stage')?.trim();
  const older = params.get('olderThanDays');
  return defined({
    page: pageFrom(params),
    pageSize: NCR_PAGE_SIZE,
    sort: oneOf(NCR_SORTS, params.get('sort')) ?? 'raised',
    dir: dirFrom(params),
    state: state === ALL_STATES ? undefined : (oneOf([...NCR_STATES, 'open'] as const, state) ?? 'open'),
    severity: oneOf(SEVERITIES, params.get('severity')),
    defect: defect && /^[A-Z0-9_-]{1,20}$/.test(defect) ? defect : undefined,
    family: positiveInt(params.get('family')),
    stage: stage && stage.length <= 40 ? stage : undefined,
    olderThanDays: older && /^\d{1,4}$/.test(older) && Number(older) <= 3650 ? Number(older) : undefined,
    assignee: assigneeFrom(params.get('assignee')),
    q: params.get('q')?.trim().slice(0, 60),
  });
}
