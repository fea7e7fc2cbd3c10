import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Paged } from '../../../shared/schemas/common';
import type { z } from 'zod';
import type { listPeopleQuery, Person } from '../../../shared/schemas/people';
import type { Filled } from '../../lib/list-filter';
import { http } from '../../lib/http';
import { peopleKeys } from './keys';

/** The query GET /api/people takes (shared listPeopleQuery), with paging always set. */
export type PeopleFilter = Filled<z.input<typeof listPeopleQuery>, 'page' | 'pageSize'>;

export const fetchPeople = (filter: PeopleFilter, signal?: AbortSignal) =>
  http<Paged<Person>>('/api/people', { query: filter, signal });

export const peopleQueryOptions = (filter: PeopleFilter) =>
  queryOptions({ queryKey: peopleKeys.list(filter), queryFn: ({ signal }) => fetchPeople(filter, signal) });

export function usePeople(filter: PeopleFilter) {
  return useQuery({ ...peopleQueryOptions(filter), placeholderData: keepPreviousData });
}
