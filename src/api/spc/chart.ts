import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { SpcChartJson } from '../../../shared/schemas/spc';
import { http } from '../../lib/http';
import { spcKeys, type SpcChartQueryInput } from './keys';

export const fetchSpcChart = (q: SpcChartQueryInput, signal?: AbortSignal) =>
  http<SpcChartJson>('/api/spc/chart', { query: q, signal });

export const spcChartQueryOptions = (q: SpcChartQueryInput) =>
  queryOptions({ queryKey: spcKeys.chart(q), queryFn: ({ signal }) => fetchSpcChart(q, signal) });

export const useSpcChart = (q: SpcChartQueryInput | null) =>
  useQuery({
    ...spcChartQueryOptions(q ?? { family: '', characteristicId: 0, from: '', to: '' }),
    enabled: q !== null,
    placeholderData: keepPreviousData,
  });
