import { queryOptions, useQuery } from '@tanstack/react-query';
import { http } from '../../lib/http';
import { mailKeys } from './keys';
import type { OutboxMessage } from './outbox';

/** One queued message with its body, as GET /api/mail/outbox/:id presents it. */
export type OutboxMessageFull = OutboxMessage & { text: string; messageId: string | null };

export const outboxMessageQueryOptions = (id: number) =>
  queryOptions({
    queryKey: mailKeys.message(id),
    queryFn: ({ signal }) => http<OutboxMessageFull>(`/api/mail/outbox/${id}`, { signal }),
  });

export const useOutboxMessage = (id: number | null) =>
  useQuery({ ...outboxMessageQueryOptions(id ?? 0), enabled: id !== null });
