import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { z } from 'zod';
import type { Paged } from '../../../shared/schemas/common';
import type { OutboxStatus, outboxQuery } from '../../../shared/schemas/mail';
import type { Filled } from '../../lib/list-filter';
import { http } from '../../lib/http';
import { mailKeys } from './keys';

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

/** The query GET /api/mail/outbox takes (shared outboxQuery), with paging always set. */
export type OutboxFilter = Filled<z.input<typeof outboxQuery>, 'page' | 'pageSize'>;

export const fetchOutbox = (filter: OutboxFilter, signal?: AbortSignal) =>
  http<Paged<OutboxMessage>>('/api/mail/outbox', { query: filter, signal });

export const outboxQueryOptions = (filter: OutboxFilter) =>
  queryOptions({ queryKey: mailKeys.outbox(filter), queryFn: ({ signal }) => fetchOutbox(filter, signal) });

export function useOutbox(filter: OutboxFilter) {
  return useQuery({ ...outboxQueryOptions(filter), placeholderData: keepPreviousData });
}
