import { z } from 'zod';
import { paging } from './common.js';

export const listAuditQuery = z.strictObject({
  ...paging,
  entity: z.string().trim().max(60).optional(),
  entityId: z.string().trim().max(60).optional(),
  actorId: z.coerce.number().int().positive().optional(),
});

export type AuditEvent = {
  id: number;
  occurredAt: string;
  actorId: number | null;
  actorName: string | null;
  actorRole: string | null;
  action: string;
  entity: string;
  entityId: string;
  before: unknown;
  after: unknown;
  requestId: string | null;
  hash: string;
};

export type AuditVerifyReport = {
  ok: boolean;
  checked: number;
  firstBroken: { id: number; reason: string } | null;
};
