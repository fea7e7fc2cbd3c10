import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AuditLogStatus } from '../../../shared/schemas/audit';
import { http } from '../../lib/http';
import { auditKeys } from './keys';

export const fetchLogStatus = (signal?: AbortSignal) => http<AuditLogStatus>('/api/audit/log', { signal });

/** How far the sequencer has integrated the trail; refreshed every few seconds while shown. */
export const logStatusQueryOptions = () =>
  queryOptions({ queryKey: auditKeys.log, queryFn: ({ signal }) => fetchLogStatus(signal), refetchInterval: 5_000 });

export function useLogStatus() {
  return useQuery(logStatusQueryOptions());
}
