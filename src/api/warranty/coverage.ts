import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { CoverageJson } from '../../../shared/schemas/warranty';
import { http } from '../../lib/http';
import { warrantyKeys } from './keys';

export const fetchCoverage = (serial: string, failedOn: string, km: number | null, signal?: AbortSignal) =>
  http<CoverageJson>('/api/warranty/coverage', { query: { serial, failedOn, km }, signal });

export const coverageQueryOptions = (serial: string, failedOn: string, km: number | null) =>
  queryOptions({
    queryKey: warrantyKeys.coverage(serial, failedOn, km),
    queryFn: ({ signal }) => fetchCoverage(serial, failedOn, km, signal),
    retry: false,
  });

/** Coverage as the form is filled: asked once a serial and a failure date are there. */
export const useCoverage = (serial: string, failedOn: string, km: number | null) =>
  useQuery({
    ...coverageQueryOptions(serial, failedOn, km),
    enabled: serial.length >= 8 && /^\d{4}-\d{2}-\d{2}$/.test(failedOn),
    placeholderData: keepPreviousData,
  });
