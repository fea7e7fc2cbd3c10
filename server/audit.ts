import { createHash } from 'node:crypto';
import canonicalize from 'canonicalize';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { AuditEvent } from './models/index.js';

export const GENESIS_HASH = '0'.repeat(64);

// an arbitrary constant naming the audit chain among this database's advisory locks
const AUDIT_CHAIN_LOCK = 72_410_002;

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

/** SHA-256 over the previous hash and the RFC 8785 canonical JSON of the event. */
export function hashEvent(prevHash: string, e: Hashed): string {
  return createHash('sha256')
    .update(prevHash)
    .update(canonicalize(e) ?? '')
    .digest('hex');
}

// the newest hash a transaction has written: while it holds the chain's lock, nobody else appends
const chainHead = new WeakMap<Transaction, string>();

/**
 * Writes one audit event inside the caller's transaction. Events are chained: the advisory lock
 * (released at commit) makes writers take turns, so each event links to the one committed before it.
 * A second event in the same transaction links to the first without asking the database again.
 */
export async function recordAudit(ctx: Ctx, transaction: Transaction, input: AuditInput): Promise<void> {
  const sequelize = AuditEvent.sequelize as Sequelize;
  let prevHash = chainHead.get(transaction);
  if (prevHash === undefined) {
    await sequelize.query('SELECT pg_advisory_xact_lock(:k)', {
      replacements: { k: AUDIT_CHAIN_LOCK },
      transaction,
    });
    const last = await sequelize.query<{ hash: string }>('SELECT hash FROM audit_events ORDER BY id DESC LIMIT 1', {
      type: QueryTypes.SELECT,
      transaction,
    });
    prevHash = last[0]?.hash ?? GENESIS_HASH;
  }
  const occurredAt = new Date();
  const body: Hashed = {
    occurredAt: occurredAt.toISOString(),
    actorId: ctx.actor?.id ?? null,
    actorRole: ctx.actor?.role ?? null,
    action: input.action,
    entity: input.entity,
    entityId: String(input.entityId),
    before: plain(input.before),
    after: plain(input.after),
    requestId: ctx.requestId,
  };
  const hash = hashEvent(prevHash, body);
  // nothing reads the row back: no RETURNING of its JSON
  await AuditEvent.create({ ...body, occurredAt, prevHash, hash }, { transaction, returning: false });
  chainHead.set(transaction, hash);
}

export type ChainReport = { ok: boolean; checked: number; firstBroken: { id: number; reason: string } | null };

/** Walks the whole chain in id order and reports the first event whose link or hash does not hold. */
export async function verifyAuditChain(sequelize: Sequelize, batch = 2000): Promise<ChainReport> {
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
    }>('SELECT * FROM audit_events WHERE id > :lastId ORDER BY id LIMIT :batch', {
      type: QueryTypes.SELECT,
      replacements: { lastId, batch },
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
