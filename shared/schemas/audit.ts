import { z } from 'zod';
import { idText, paging, text } from './common.js';

export const listAuditQuery = z.strictObject({
  ...paging,
  entity: text().trim().max(60).optional(),
  entityId: text().trim().max(60).optional(),
  actorId: idText().optional(),
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
