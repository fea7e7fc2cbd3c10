import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type {
  AlertsJson,
  NcrAgeJson,
  ParetoJson,
  ParetoQuery,
  SearchJson,
  ShippingJson,
  TeardownQueueRow,
  WipJson,
  WipQuery,
  YieldJson,
  YieldQuery,
} from '../../../shared/schemas/line';
import { http } from '../../lib/http';

/**
 * The line's reads: the homes, the board, search, yields and the Pareto. Live lists refresh
 * themselves every minute while on screen.
 */
const LIVE = 60_000;

export const lineKeys = {
  all: ['line'] as const,
  wip: (q: WipQuery) => ['line', 'wip', q] as const,
  teardown: () => ['line', 'teardown-queue'] as const,
  ncrAges: () => ['line', 'ncr-ages'] as const,
  alerts: () => ['line', 'alerts'] as const,
  shipping: () => ['line', 'shipping'] as const,
  search: (q: string) => ['line', 'search', q] as const,
  yields: (q: YieldQuery) => ['line', 'yields', q] as const,
  pareto: (q: ParetoQuery) => ['line', 'pareto', q] as const,
};

export const wipQueryOptions = (q: WipQuery) =>
  queryOptions({
    queryKey: lineKeys.wip(q),
    queryFn: ({ signal }) => http<WipJson>('/api/line/wip', { query: q, signal }),
    refetchInterval: LIVE,
  });
export const useWip = (q: WipQuery, enabled = true) =>
  useQuery({ ...wipQueryOptions(q), placeholderData: keepPreviousData, enabled });

export const useTeardownQueue = () =>
  useQuery({
    queryKey: lineKeys.teardown(),
    queryFn: ({ signal }) => http<{ rows: TeardownQueueRow[]; total: number }>('/api/line/teardown-queue', { signal }),
    refetchInterval: LIVE,
  });

export const useNcrAges = () =>
  useQuery({
    queryKey: lineKeys.ncrAges(),
    queryFn: ({ signal }) => http<NcrAgeJson>('/api/line/ncr-ages', { signal }),
    refetchInterval: LIVE,
  });

export const useAlerts = (enabled = true) =>
  useQuery({
    queryKey: lineKeys.alerts(),
    queryFn: ({ signal }) => http<AlertsJson>('/api/line/alerts', { signal }),
    refetchInterval: LIVE,
    enabled,
  });

export const useShipping = () =>
  useQuery({
    queryKey: lineKeys.shipping(),
    queryFn: ({ signal }) => http<ShippingJson>('/api/line/shipping', { signal }),
    refetchInterval: LIVE,
  });

export const searchQueryOptions = (q: string) =>
  queryOptions({
    queryKey: lineKeys.search(q),
    queryFn: ({ signal }) => http<SearchJson>('/api/search', { query: { q }, signal }),
  });
export const useSearch = (q: string) =>
  useQuery({ ...searchQueryOptions(q), enabled: q.trim().length >= 2, placeholderData: keepPreviousData });

export const yieldsQueryOptions = (q: YieldQuery) =>
  queryOptions({
    queryKey: lineKeys.yields(q),
    queryFn: ({ signal }) => http<YieldJson>('/api/yields', { query: q, signal }),
  });
export const useYields = (q: YieldQuery) => useQuery({ ...yieldsQueryOptions(q), placeholderData: keepPreviousData });

export const paretoQueryOptions = (q: ParetoQuery) =>
  queryOptions({
    queryKey: lineKeys.pareto(q),
    queryFn: ({ signal }) => http<ParetoJson>('/api/ncr-pareto', { query: q, signal }),
  });
export const usePareto = (q: ParetoQuery) => useQuery({ ...paretoQueryOptions(q), placeholderData: keepPreviousData });

/** Where a CSV of the same numbers downloads from. */
export const csvHref = (path: '/api/yields/export.csv' | '/api/ncr-pareto/export.csv', q: Record<string, unknown>) =>
  `${path}?${new URLSearchParams(
    Object.entries(q)
      .filter(([, v]) => v !== undefined && v !== null && v !== '')
      .map(([k, v]) => [k, String(v)]),
  )}`;
