import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { AuditEvent } from '../../../shared/schemas/audit';
import type { Paged } from '../../../shared/schemas/common';
import { http } from '../../lib/http';
import { auditKeys } from './keys';

export type AuditFilter = {
  page: number;
  pageSize: number;
  entity?: string;
  entityId?: string;
  actorId?: number;
  /** calendar days in the plant's time zone, both included */
  from?: string;
  to?: string;
};

export const fetchAuditEvents = (filter: AuditFilter, signal?: AbortSignal) =>
  http<Paged<AuditEvent>>('/api/audit/events', { query: filter, signal });

export const auditEventsQueryOptions = (filter: AuditFilter) =>
  queryOptions({ queryKey: auditKeys.events(filter), queryFn: ({ signal }) => fetchAuditEvents(filter, signal) });

export function useAuditEvents(filter: AuditFilter) {
  return useQuery({ ...auditEventsQueryOptions(filter), placeholderData: keepPreviousData });
}
