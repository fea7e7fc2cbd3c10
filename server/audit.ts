import { createHash } from 'node:crypto';
import canonicalize from 'canonicalize';
import { QueryTypes, type Model, type Sequelize, type Transaction } from 'sequelize';
import { AuditEvent } from './models/index.js';

export const GENESIS_HASH = '0'.repeat(64);

/** Who is acting and for which request: every write path carries one. */
export type Ctx = {
  /** `name` as signed in, where the caller has it (spares a lookup for replies that name the actor). */
  actor: { id: number; role: string; name?: string } | null;
  requestId: string | null;
};

export const systemCtx = (requestId: string | null = null): Ctx => ({ actor: null, requestId });

export type AuditInput = {
  action: string;
  entity: string;
  entityId: string | number;
  before?: unknown;
  after?: unknown;
};

type Hashed = {
  occurredAt: string;
  actorId: number | null;
  actorRole: string | null;
  action: string;
  entity: string;
  entityId: string;
  before: unknown;
  after: unknown;
  requestId: string | null;
};

/** Plain JSON (dates as ISO strings, no undefined) so the stored JSONB reads back identical. */
function plain(v: unknown): unknown {
  return v === undefined ? null : JSON.parse(JSON.stringify(v));
}

/**
 * The hash chain of the events written before the Merkle log existed (migration
 * 20261203090000-audit-ledger): SHA-256 over the previous hash and the RFC 8785 canonical JSON of
 * the event. Those events keep their chain and are also the log's first leaves.
 */
export function hashEvent(prevHash: string, e: Hashed): string {
  return createHash('sha256')
    .update(prevHash)
    .update(canonicalize(e) ?? '')
    .digest('hex');
}

const INSERT_EVENT = `INSERT INTO audit_events
  (occurred_at, actor_id, actor_role, action, entity, entity_id, before, after, request_id)
  VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9)`;

function eventRow(ctx: Ctx, input: AuditInput): unknown[] {
  const before = plain(input.before);
  const after = plain(input.after);
  return [
    new Date(),
    ctx.actor?.id ?? null,
    ctx.actor?.role ?? null,
    input.action,
    input.entity,
    String(input.entityId),
    before === null ? null : JSON.stringify(before),
    after === null ? null : JSON.stringify(after),
    ctx.requestId,
  ];
}

/**
 * Writes one audit event inside the caller's transaction, and nothing else: no lock, no read of the
 * previous event, no position. A trigger queues it (audit_pending) in the same transaction; once it
 * commits, the sequencer (server/ledger/sequencer.ts) gives it the next leaf of the Merkle log. If
 * the transaction rolls back, the event and its place in the queue go with it.
 */
export async function recordAudit(ctx: Ctx, transaction: Transaction, input: AuditInput): Promise<void> {
  const sequelize = AuditEvent.sequelize as Sequelize;
  // nothing reads the row back: no RETURNING of its JSON
  await sequelize.query(INSERT_EVENT, { bind: eventRow(ctx, input), transaction, type: QueryTypes.INSERT });
}

/** What an audited change records besides the fields it changed. */
export type AuditNote = { action: string; entity: string; entityId: string | number; extra?: Record<string, unknown> };

/**
 * Writes a change to a record and its audit event in the caller's transaction. The event's before
 * holds the changed fields as they were, its after the same fields as they are now plus `extra`;
 * a field can be shown under another name (`currentStageId` as `currentStage`) through `names`.
 */
export async function auditedUpdate<M extends Model>(
  ctx: Ctx,
  transaction: Transaction,
  record: M,
  change: Partial<M['_attributes']>,
  note: AuditNote,
  names: Record<string, string> = {},
): Promise<void> {
  const before: Record<string, unknown> = {};
  const after: Record<string, unknown> = {};
  for (const [field, value] of Object.entries(change)) {
    const shown = names[field] ?? field;
    before[shown] = record.get(field);
    after[shown] = value;
  }
  await record.update(change, { transaction });
  await recordAudit(ctx, transaction, {
    action: note.action,
    entity: note.entity,
    entityId: note.entityId,
    before,
    after: { ...after, ...note.extra },
  });
}

/** The same, returning the event's id: for callers that hand out a receipt for it (documents). */
export async function recordAuditReturningId(ctx: Ctx, transaction: Transaction, input: AuditInput): Promise<number> {
  const sequelize = AuditEvent.sequelize as Sequelize;
  const [rows] = (await sequelize.query(`${INSERT_EVENT} RETURNING id`, {
    bind: eventRow(ctx, input),
    transaction,
    type: QueryTypes.INSERT,
  })) as unknown as [{ id: number }[]];
  return Number(rows[0]!.id);
}

export type ChainReport = { ok: boolean; checked: number; firstBroken: { id: number; reason: string } | null };

/**
 * Walks the chained history (the events written before the Merkle log) in id order and reports the
 * first one whose link or hash does not hold. Events written since carry no chain; the log covers them.
 */
export async function verifyAuditChain(
  sequelize: Sequelize,
  batch = 2000,
  transaction?: Transaction,
): Promise<ChainReport> {
  let prevHash = GENESIS_HASH;
  let lastId = 0;
  let checked = 0;
  for (;;) {
    const rows = await sequelize.query<{
      id: number;
      occurred_at: Date;
      actor_id: number | null;
      actor_role: string | null;
      action: string;
      entity: string;
      entity_id: string;
      before: unknown;
      after: unknown;
      request_id: string | null;
      prev_hash: string;
      hash: string;
    }>('SELECT * FROM audit_events WHERE id > :lastId AND hash IS NOT NULL ORDER BY id LIMIT :batch', {
      type: QueryTypes.SELECT,
      replacements: { lastId, batch },
      transaction,
    });
    if (!rows.length) break;
    for (const r of rows) {
      if (r.prev_hash !== prevHash) {
        return { ok: false, checked, firstBroken: { id: r.id, reason: 'does not link to the event before it' } };
      }
      const expected = hashEvent(prevHash, {
        occurredAt: new Date(r.occurred_at).toISOString(),
        actorId: r.actor_id,
        actorRole: r.actor_role,
        action: r.action,
        entity: r.entity,
        entityId: r.entity_id,
        before: r.before,
        after: r.after,
        requestId: r.request_id,
      });
      if (expected !== r.hash) {
        return { ok: false, checked, firstBroken: { id: r.id, reason: 'its content does not match its hash' } };
      }
      prevHash = r.hash;
      lastId = r.id;
      checked += 1;
    }
  }
  return { ok: true, checked, firstBroken: null };
}
