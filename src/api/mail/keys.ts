import type { OutboxFilter } from './outbox';

export const mailKeys = {
  all: ['mail'] as const,
  outbox: (filter: OutboxFilter) => ['mail', 'outbox', filter] as const,
  sink: ['mail', 'sink'] as const,
  message: (id: number) => ['mail', 'outbox', 'message', id] as const,
};
