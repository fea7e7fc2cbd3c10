import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { z } from 'zod';
import type { AuditEvent, listAuditQuery } from '../../../shared/schemas/audit';
import type { Paged } from '../../../shared/schemas/common';
import { http } from '../../lib/http';
import type { Filled } from '../../lib/list-filter';
import { auditKeys } from './keys';

/** The query GET /api/audit/events takes (shared listAuditQuery): `from` and `to` are days in the plant's zone, both included. */
export type AuditFilter = Filled<z.input<typeof listAuditQuery>, 'page' | 'pageSize'>;

export const fetchAuditEvents = (filter: AuditFilter, signal?: AbortSignal) =>
  http<Paged<AuditEvent>>('/api/audit/events', { query: filter, signal });

export const auditEventsQueryOptions = (filter: AuditFilter) =>
  queryOptions({ queryKey: auditKeys.events(filter), queryFn: ({ signal }) => fetchAuditEvents(filter, signal) });

export function useAuditEvents(filter: AuditFilter) {
  return useQuery({ ...auditEventsQueryOptions(filter), placeholderData: keepPreviousData });
}
