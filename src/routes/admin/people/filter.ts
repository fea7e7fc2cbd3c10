import { ROLES } from '../../../../shared/roles';
import type { PeopleFilter } from '../../../api/people/list-people';
import { defined, oneOf, pageFrom } from '../../../lib/list-filter';

export const PEOPLE_PAGE_SIZE = 25;

/** The filters "Clear filters" empties. */
export const PEOPLE_FILTERS = ['q', 'role', 'active'] as const;

/** The list's state lives in the address, so a filtered view can be bookmarked or sent on. */
export function peopleFilterFrom(params: URLSearchParams): PeopleFilter {
  return defined({
    page: pageFrom(params),
    pageSize: PEOPLE_PAGE_SIZE,
    q: params.get('q')?.trim(),
    role: oneOf(ROLES, params.get('role')),
    active: oneOf(['true', 'false'] as const, params.get('active')),
  });
}
