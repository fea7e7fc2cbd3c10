import { queryOptions, useQuery } from '@tanstack/react-query';
import { http } from '../../lib/http';
import { coreKeys } from './keys';
import type { CoreDetail } from './types';

export const fetchCore = (serial: string, signal?: AbortSignal) =>
  http<CoreDetail>(`/api/cores/${encodeURIComponent(serial)}`, { signal });

export const coreQueryOptions = (serial: string) =>
  queryOptions({ queryKey: coreKeys.one(serial), queryFn: ({ signal }) => fetchCore(serial, signal) });

export const useCore = (serial: string, { enabled = true }: { enabled?: boolean } = {}) =>
  useQuery({ ...coreQueryOptions(serial), enabled });
