import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Paged } from '../../../shared/schemas/common';
import type { CaState, CaSummaryJson } from '../../../shared/schemas/corrective-action';
import { http } from '../../lib/http';
import { caKeys } from './keys';

export const fetchCas = (state: CaState | undefined, page: number, signal?: AbortSignal) =>
  http<Paged<CaSummaryJson>>('/api/corrective-actions', { query: { state, page, pageSize: 50 }, signal });

export const casQueryOptions = (state: CaState | undefined, page = 1) =>
  queryOptions({ queryKey: caKeys.list(state, page), queryFn: ({ signal }) => fetchCas(state, page, signal) });

export const useCas = (state: CaState | undefined, page = 1) =>
  useQuery({ ...casQueryOptions(state, page), placeholderData: keepPreviousData });
