import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { WeibullJson } from '../../../shared/schemas/warranty';
import { http } from '../../lib/http';
import type { AnalysisFilter } from './analysis';
import { warrantyKeys } from './keys';

export const fetchWeibull = (q: AnalysisFilter, signal?: AbortSignal) =>
  http<WeibullJson>('/api/warranty/weibull', { query: q, signal });

export const weibullQueryOptions = (q: AnalysisFilter) =>
  queryOptions({ queryKey: warrantyKeys.weibull(q), queryFn: ({ signal }) => fetchWeibull(q, signal) });

export const useWeibull = (q: AnalysisFilter) =>
  useQuery({ ...weibullQueryOptions(q), placeholderData: keepPreviousData });
