import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Paged } from '../../../shared/schemas/common';
import type { Person } from '../../../shared/schemas/people';
import type { Role } from '../../../shared/roles';
import { http } from '../../lib/http';
import { peopleKeys } from './keys';

export type PeopleFilter = { page: number; pageSize: number; q?: string; role?: Role; active?: 'true' | 'false' };

export const fetchPeople = (filter: PeopleFilter, signal?: AbortSignal) =>
  http<Paged<Person>>('/api/people', { query: filter, signal });

export const peopleQueryOptions = (filter: PeopleFilter) =>
  queryOptions({ queryKey: peopleKeys.list(filter), queryFn: ({ signal }) => fetchPeople(filter, signal) });

export function usePeople(filter: PeopleFilter) {
  return useQuery({ ...peopleQueryOptions(filter), placeholderData: keepPreviousData });
}
