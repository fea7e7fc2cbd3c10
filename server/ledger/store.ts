// Reads of the stored tree: state, leaves, complete subtrees and signed heads.
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { LogEntry } from '../../shared/ledger/entry.js';
import { toBase64, type SignedHead } from '../../shared/ledger/head.js';
import { nodesNeeded, toHex, type Hash, type NodeSource } from '../../shared/ledger/merkle.js';

export type LogState = { treeSize: number; rootHash: Buffer; frontier: Buffer[]; integratedAt: Date | null };

export async function readState(sequelize: Sequelize, transaction?: Transaction): Promise<LogState> {
  const [row] = await sequelize.query<{
    tree_size: number;
    root_hash: Buffer;
    frontier: Buffer;
    integrated_at: Date | null;
  }>('SELECT tree_size, root_hash, frontier, integrated_at FROM audit_log_state', {
    type: QueryTypes.SELECT,
    transaction,
  });
  if (!row) throw new Error('audit_log_state has no row: is the audit-ledger migration applied?');
  const frontier: Buffer[] = [];
  for (let i = 0; i < row.frontier.length; i += 32) frontier.push(row.frontier.subarray(i, i + 32));
  return { treeSize: Number(row.tree_size), rootHash: row.root_hash, frontier, integratedAt: row.integrated_at };
}

export type EventRow = {
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
};

export const EVENT_COLUMNS = `e.id, e.occurred_at, e.actor_id, e.actor_role, e.action, e.entity, e.entity_id,
  e.before, e.after, e.request_id`;

/** A stored event as the log's leaf sees it. */
export const entryOf = (r: EventRow): LogEntry => ({
  id: Number(r.id),
  occurredAt: new Date(r.occurred_at).toISOString(),
  actorId: r.actor_id,
  actorRole: r.actor_role,
  action: r.action,
  entity: r.entity,
  entityId: r.entity_id,
  before: r.before ?? null,
  after: r.after ?? null,
  requestId: r.request_id,
});

/**
 * Runs a proof builder against the stored tree: it is planned once to learn which complete
 * subtrees it needs, those are read in one query (leaves for level 0, the node cache above), and
 * then it runs for real.
 */
export async function withStoredNodes<T>(
  sequelize: Sequelize,
  build: (get: NodeSource) => T,
  transaction?: Transaction,
): Promise<T> {
  const need = nodesNeeded(build);
  const leaves = need.filter((n) => n.level === 0).map((n) => n.index);
  const inner = need.filter((n) => n.level > 0);
  const rows = await sequelize.query<{ level: number; idx: number; hash: Buffer }>(
    `SELECT 0 AS level, leaf_index AS idx, leaf_hash AS hash FROM audit_leaves WHERE leaf_index = ANY($1::bigint[])
     UNION ALL
     SELECT n.level, n.node_index, n.hash FROM audit_tree_nodes n
       JOIN unnest($2::int[], $3::bigint[]) AS w(level, idx) ON n.level = w.level AND n.node_index = w.idx`,
    {
      type: QueryTypes.SELECT,
      bind: [leaves, inner.map((n) => n.level), inner.map((n) => n.index)],
      transaction,
    },
  );
  const found = new Map(rows.map((r) => [`${r.level}:${Number(r.idx)}`, new Uint8Array(r.hash) as Hash]));
  return build((level, index) => {
    const h = found.get(`${level}:${index}`);
    if (!h) throw new Error(`the stored tree has no subtree ${level}:${index}`);
    return h;
  });
}

type HeadRow = {
  tree_size: number;
  root_hash: Buffer;
  signed_ms: number;
  key_id: string;
  public_key: Buffer;
  signature: Buffer;
};

const headOf = (r: HeadRow): SignedHead => ({
  treeSize: Number(r.tree_size),
  rootHash: toHex(r.root_hash),
  timestamp: Number(r.signed_ms),
  keyId: r.key_id,
  signature: toBase64(r.signature),
});

const HEAD_COLUMNS = 'tree_size, root_hash, signed_ms, key_id, public_key, signature';

export async function latestHead(sequelize: Sequelize, transaction?: Transaction): Promise<SignedHead | null> {
  const [row] = await sequelize.query<HeadRow>(
    `SELECT ${HEAD_COLUMNS} FROM audit_log_heads ORDER BY tree_size DESC LIMIT 1`,
    { type: QueryTypes.SELECT, transaction },
  );
  return row ? headOf(row) : null;
}

/** The newest signed head that covers a leaf. */
export async function headCovering(sequelize: Sequelize, leafIndex: number): Promise<SignedHead | null> {
  const [row] = await sequelize.query<HeadRow>(
    `SELECT ${HEAD_COLUMNS} FROM audit_log_heads WHERE tree_size > $1 ORDER BY tree_size DESC LIMIT 1`,
    { type: QueryTypes.SELECT, bind: [leafIndex] },
  );
  return row ? headOf(row) : null;
}

/** Heads in size order, with each one's public key (base64), for the export and for verify. */
export async function headsPage(
  sequelize: Sequelize,
  afterSize: number,
  limit: number,
  transaction?: Transaction,
): Promise<(SignedHead & { publicKey: string })[]> {
  const rows = await sequelize.query<HeadRow>(
    `SELECT ${HEAD_COLUMNS} FROM audit_log_heads WHERE tree_size > $1 ORDER BY tree_size LIMIT $2`,
    { type: QueryTypes.SELECT, bind: [afterSize, limit], transaction },
  );
  return rows.map((r) => ({ ...headOf(r), publicKey: toBase64(r.public_key) }));
}
