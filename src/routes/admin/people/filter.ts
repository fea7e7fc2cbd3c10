import { ROLES, type Role } from '../../../../shared/roles';
import type { PeopleFilter } from '../../../api/people/list-people';

export const PEOPLE_PAGE_SIZE = 25;

/** The list's state lives in the address, so a filtered view can be bookmarked or sent on. */
export function peopleFilterFrom(params: URLSearchParams): PeopleFilter {
  const page = Number(params.get('page'));
  const role = params.get('role');
  const active = params.get('active');
  const q = params.get('q')?.trim();
  return {
    page: Number.isInteger(page) && page > 0 ? page : 1,
    pageSize: PEOPLE_PAGE_SIZE,
    ...(q ? { q } : {}),
    ...(role && (ROLES as readonly string[]).includes(role) ? { role: role as Role } : {}),
    ...(active === 'true' || active === 'false' ? { active } : {}),
  };
}
