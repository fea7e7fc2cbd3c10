import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Paged } from '../../../shared/schemas/common';
import type { z } from 'zod';
import type { CoreSummary, intakeLogQuery } from '../../../shared/schemas/intake';
import { http } from '../../lib/http';
import type { Filled } from '../../lib/list-filter';
import { coreKeys } from './keys';

/** The query GET /api/cores takes (shared intakeLogQuery), with paging and sorting always set. */
export type IntakeLogFilter = Filled<z.input<typeof intakeLogQuery>, 'page' | 'pageSize' | 'sort' | 'dir'>;

export const fetchIntakeLog = (filter: IntakeLogFilter, signal?: AbortSignal) =>
  http<Paged<CoreSummary>>('/api/cores', { query: filter, signal });

export const intakeLogQueryOptions = (filter: IntakeLogFilter) =>
  queryOptions({ queryKey: coreKeys.log(filter), queryFn: ({ signal }) => fetchIntakeLog(filter, signal) });

export function useIntakeLog(filter: IntakeLogFilter) {
  return useQuery({ ...intakeLogQueryOptions(filter), placeholderData: keepPreviousData });
}
