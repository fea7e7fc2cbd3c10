import { z } from 'zod';
import { paging } from './common.js';

export const OUTBOX_STATUSES = ['pending', 'sending', 'sent', 'failed'] as const;
export type OutboxStatus = (typeof OUTBOX_STATUSES)[number];

/** GET /api/mail/outbox: a page of the queued messages, of one delivery state or all. */
export const outboxQuery = z.strictObject({ ...paging, status: z.enum(OUTBOX_STATUSES).optional() });

/** One message the loopback mail sink received (server/mail/sink.ts), as GET /api/mail/sink returns it. */
export type SinkMessage = {
  file: string;
  receivedAt: string;
  messageId: string | null;
  from: string;
  to: string[];
  subject: string;
  text: string;
  headers: Record<string, string>;
};
