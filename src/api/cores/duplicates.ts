import { queryOptions, useQuery } from '@tanstack/react-query';
import { http } from '../../lib/http';
import { coreKeys } from './keys';
import type { Duplicate } from './types';

export type DuplicateCheck = { castingNumber: string; idNumber?: string };

export const fetchDuplicates = (numbers: DuplicateCheck, signal?: AbortSignal) =>
  http<Duplicate[]>('/api/cores/duplicates', { query: numbers, signal });

export const duplicatesQueryOptions = (numbers: DuplicateCheck) =>
  queryOptions({ queryKey: coreKeys.duplicates(numbers), queryFn: ({ signal }) => fetchDuplicates(numbers, signal) });

/** Asked only once the numbers are well formed (null until then). */
export const useDuplicates = (numbers: DuplicateCheck | null) =>
  useQuery({
    ...duplicatesQueryOptions(numbers ?? { castingNumber: '' }),
    enabled: numbers !== null,
  });
