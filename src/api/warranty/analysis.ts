import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { AnalysisJson, AnalysisQuery } from '../../../shared/schemas/warranty';
import { http } from '../../lib/http';
import { warrantyKeys } from './keys';

export type AnalysisFilter = Partial<AnalysisQuery>;

export const fetchAnalysis = (q: AnalysisFilter, signal?: AbortSignal) =>
  http<AnalysisJson>('/api/warranty/analysis', { query: q, signal });

export const analysisQueryOptions = (q: AnalysisFilter) =>
  queryOptions({ queryKey: warrantyKeys.analysis(q), queryFn: ({ signal }) => fetchAnalysis(q, signal) });

export const useAnalysis = (q: AnalysisFilter) =>
  useQuery({ ...analysisQueryOptions(q), placeholderData: keepPreviousData });

/** The server's CSV of every rate, for the same filter. */
export const analysisCsvHref = (q: AnalysisFilter) => {
  const s = new URLSearchParams(
    Object.entries(q)
      .filter(([, v]) => v !== undefined && v !== null)
      .map(([k, v]) => [k, String(v)]),
  );
  return `/api/warranty/analysis.csv${s.size ? `?${s}` : ''}`;
};
