import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Paged } from '../../../shared/schemas/common';
import type { CoreSummary, GRADES, INTAKE_SORTS, SOURCES } from '../../../shared/schemas/intake';
import { http } from '../../lib/http';
import { coreKeys } from './keys';

/** The query GET /api/cores takes (shared intakeLogQuery), with paging and sorting always set. */
export type IntakeLogFilter = {
  page: number;
  pageSize: number;
  sort: (typeof INTAKE_SORTS)[number];
  dir: 'asc' | 'desc';
  family?: number;
  source?: (typeof SOURCES)[number];
  grade?: (typeof GRADES)[number];
  accepted?: 'true' | 'false';
  from?: string;
  to?: string;
  q?: string;
};

export const fetchIntakeLog = (filter: IntakeLogFilter, signal?: AbortSignal) =>
  http<Paged<CoreSummary>>('/api/cores', { query: filter, signal });

export const intakeLogQueryOptions = (filter: IntakeLogFilter) =>
  queryOptions({ queryKey: coreKeys.log(filter), queryFn: ({ signal }) => fetchIntakeLog(filter, signal) });

export function useIntakeLog(filter: IntakeLogFilter) {
  return useQuery({ ...intakeLogQueryOptions(filter), placeholderData: keepPreviousData });
}
