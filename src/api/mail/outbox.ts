import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Paged } from '../../../shared/schemas/common';
import { http } from '../../lib/http';
import { mailKeys } from './keys';

export const OUTBOX_STATUSES = ['pending', 'sending', 'sent', 'failed'] as const;
export type OutboxStatus = (typeof OUTBOX_STATUSES)[number];

/** One queued message as GET /api/mail/outbox presents it (server/routes/mail.ts). */
export type OutboxMessage = {
  id: number;
  to: string;
  subject: string;
  reason: string;
  status: OutboxStatus;
  attempts: number;
  lastError: string | null;
  createdAt: string;
  sentAt: string | null;
};

export type OutboxFilter = { page: number; pageSize: number; status?: OutboxStatus };

export const fetchOutbox = (filter: OutboxFilter, signal?: AbortSignal) =>
  http<Paged<OutboxMessage>>('/api/mail/outbox', { query: filter, signal });

export const outboxQueryOptions = (filter: OutboxFilter) =>
  queryOptions({ queryKey: mailKeys.outbox(filter), queryFn: ({ signal }) => fetchOutbox(filter, signal) });

export function useOutbox(filter: OutboxFilter) {
  return useQuery({ ...outboxQueryOptions(filter), placeholderData: keepPreviousData });
}
