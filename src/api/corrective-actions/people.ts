import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PersonOption } from '../../../shared/schemas/corrective-action';
import { http } from '../../lib/http';
import { caKeys } from './keys';

export const fetchPeople = (signal?: AbortSignal) => http<PersonOption[]>('/api/corrective-actions/people', { signal });

export const peopleQueryOptions = () =>
  queryOptions({ queryKey: caKeys.people, queryFn: ({ signal }) => fetchPeople(signal), staleTime: 60_000 });

export const usePeople = () => useQuery(peopleQueryOptions());
