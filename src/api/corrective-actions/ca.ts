import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CaJson } from '../../../shared/schemas/corrective-action';
import { http } from '../../lib/http';
import { caKeys } from './keys';

export const caUrl = (number: string) => `/api/corrective-actions/${encodeURIComponent(number)}`;

export const fetchCa = (number: string, signal?: AbortSignal) => http<CaJson>(caUrl(number), { signal });

export const caQueryOptions = (number: string) =>
  queryOptions({ queryKey: caKeys.one(number), queryFn: ({ signal }) => fetchCa(number, signal) });

export const useCa = (number: string) => useQuery(caQueryOptions(number));
