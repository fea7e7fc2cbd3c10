import { z } from 'zod';
import { idText, isoDate, paging, text } from './common.js';

/**
 * The trail's filters: a record (entity, entity id), a person, and a range of calendar days in the
 * plant's time zone, both ends included.
 */
export const listAuditQuery = z
  .strictObject({
    ...paging,
    entity: text().trim().max(60).optional(),
    entityId: text().trim().max(60).optional(),
    actorId: idText().optional(),
    from: isoDate().optional(),
    to: isoDate().optional(),
  })
  .refine((q) => !q.from || !q.to || q.from <= q.to, {
    path: ['to'],
    message: 'The last day comes before the first.',
  });

/** The people who have changed something, for the trail's person filter. */
export type AuditActor = { id: number; name: string; role: string; active: boolean };

export type AuditEvent = {
  id: number;
  occurredAt: string;
  actorId: number | null;
  actorName: string | null;
  actorRole: string | null;
  action: string;
  entity: string;
  entityId: string;
  /** the record in words where its id says little (a person's name, a result's stage and serial), else null */
  recordLabel: string | null;
  before: unknown;
  after: unknown;
  requestId: string | null;
  /** the old chain's hash, for events written before the Merkle log; null since */
  hash: string | null;
  /** the event's place in the Merkle log (0-based), or null while it waits to be integrated */
  leafIndex: number | null;
};

export type SignedHeadJson = {
  treeSize: number;
  rootHash: string;
  timestamp: number;
  keyId: string;
  signature: string;
  publicKey?: string;
};

/** How far the Merkle log has integrated the trail, and whether heads are being signed. */
export type AuditLogStatus = {
  treeSize: number;
  rootHash: string;
  integratedAt: string | null;
  /** committed events waiting for their leaf */
  pending: number;
  oldestPendingAt: string | null;
  latestHead: SignedHeadJson | null;
  signing: { keyId: string; publicKey: string } | null;
};

export type AuditVerifyReport = {
  ok: boolean;
  /** events checked against their leaves in the log */
  checked: number;
  /** the first problem found: an event (id) or the tree, a head or the state (id null) */
  firstBroken: { id: number | null; reason: string } | null;
  /** every problem found, up to 20, first first */
  problems: string[];
  /** the hash chain of the events written before the log */
  chain: { checked: number };
  log: AuditLogStatus;
  /** heads whose root was recomputed and matched, of all heads (all signatures are checked) */
  heads: { checked: number; total: number };
};

export const consistencyQuery = z.strictObject({
  from: z.coerce.number().int().min(0).max(Number.MAX_SAFE_INTEGER),
  to: z.coerce.number().int().min(0).max(Number.MAX_SAFE_INTEGER),
});

export const headsQuery = z.strictObject({
  after: z.coerce.number().int().min(-1).max(Number.MAX_SAFE_INTEGER).default(-1),
  limit: z.coerce.number().int().min(1).max(10_000).default(1000),
});
