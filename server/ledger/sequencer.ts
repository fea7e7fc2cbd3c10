// The sequencer: gives committed audit events their leaves in the Merkle log, and signs log heads.
//
// Writers never wait for it. recordAudit inserts an event and a trigger queues it in audit_pending,
// both in the writer's transaction, so a queued row is visible exactly when its event has committed,
// and a rolled-back event leaves no queued row. A pass takes the queued rows it can see, in queue
// order, appends their leaves after the current tree size, and deletes them from the queue, all in
// one transaction. So:
// - nothing is skipped: an event that commits late is still queued, and the next pass after its
//   commit takes it; there is no cursor over ids that could run past it while it is open;
// - nothing is taken twice: its queue row goes in the same transaction as its leaf, and
//   audit_leaves.event_id is unique (a second sequencer that somehow ran at once would fail there);
// - positions follow commit order as far as a pass can see it: every event that committed before a
//   pass's snapshot is placed before every event that committed after it; within one pass, a
//   transaction's events stay together (queue xid, then id);
// - one sequencer per database: a transaction-level advisory lock taken with try, so when several
//   API processes run one, the others skip that tick. The lock goes with the transaction, so a
//   process that dies mid-pass leaves neither a lock nor half a pass behind.
import { QueryTypes, type Sequelize } from 'sequelize';
import type { SignedHead } from '../../shared/ledger/head.js';
import { appendLeaves, rootFromFrontier, toHex, type Hash, type Hasher } from '../../shared/ledger/merkle.js';
import { entryBytes } from '../../shared/ledger/entry.js';
import { nodeHasher, type Signer } from './signer.js';
import { EVENT_COLUMNS, entryOf, readState, type EventRow } from './store.js';

// an arbitrary constant naming the sequencer among this database's advisory locks
export const SEQUENCER_LOCK = 72_410_003;

export type SequencerOptions = {
  signer?: Signer | null;
  /** Sign a new head when the tree has grown and the last head is at least this old (default 60 s). */
  headIntervalMs?: number;
  /** Events per pass (default 2000). */
  batch?: number;
  hasher?: Hasher;
};

export type PassResult = {
  /** false when another sequencer held the lock */
  ran: boolean;
  integrated: number;
  treeSize: number;
  /** the pass took a full batch: more may be waiting */
  more: boolean;
  head: SignedHead | null;
};

/**
 * One pass. `wait` blocks for the lock (up to 5 s) instead of skipping; `forceHead` signs a head for
 * the new size whatever the interval (a receipt asked for one).
 */
export async function integratePass(
  sequelize: Sequelize,
  opts: SequencerOptions & { wait?: boolean; forceHead?: boolean } = {},
): Promise<PassResult> {
  const h = opts.hasher ?? nodeHasher;
  const batch = opts.batch ?? 2000;
  return sequelize.transaction(async (transaction) => {
    const q = <T extends object>(sql: string, bind: unknown[] = []) =>
      sequelize.query<T>(sql, { type: QueryTypes.SELECT, bind, transaction });
    if (opts.wait) {
      await sequelize.query("SET LOCAL lock_timeout = '5s'", { transaction });
      await q('SELECT pg_advisory_xact_lock($1)', [SEQUENCER_LOCK]);
    } else {
      const [lock] = await q<{ ok: boolean }>('SELECT pg_try_advisory_xact_lock($1) AS ok', [SEQUENCER_LOCK]);
      if (!lock?.ok) return { ran: false, integrated: 0, treeSize: -1, more: false, head: null };
    }
    // read after the lock: this statement's snapshot sees the previous pass's commit
    const state = await readState(sequelize, transaction);
    const rows = await q<EventRow>(
      `SELECT ${EVENT_COLUMNS} FROM audit_pending p JOIN audit_events e ON e.id = p.event_id
        ORDER BY p.xid NULLS FIRST, p.event_id LIMIT $1`,
      [batch],
    );
    let size = state.treeSize;
    let root: Hash = state.rootHash;
    if (rows.length) {
      const leafHashes = rows.map((r) => h.leaf(entryBytes(entryOf(r))));
      const grown = appendLeaves(h, size, state.frontier, leafHashes);
      await sequelize.query(
        `INSERT INTO audit_leaves (leaf_index, event_id, leaf_hash)
         SELECT i, e, decode(x, 'hex') FROM unnest($1::bigint[], $2::bigint[], $3::text[]) AS u(i, e, x)`,
        {
          bind: [rows.map((_, i) => size + i), rows.map((r) => Number(r.id)), leafHashes.map(toHex)],
          transaction,
        },
      );
      if (grown.nodes.length) {
        await sequelize.query(
          `INSERT INTO audit_tree_nodes (level, node_index, hash)
           SELECT l, i, decode(x, 'hex') FROM unnest($1::int[], $2::bigint[], $3::text[]) AS u(l, i, x)`,
          {
            bind: [
              grown.nodes.map((n) => n.level),
              grown.nodes.map((n) => n.index),
              grown.nodes.map((n) => toHex(n.hash)),
            ],
            transaction,
          },
        );
      }
      await sequelize.query('DELETE FROM audit_pending WHERE event_id = ANY($1::bigint[])', {
        bind: [rows.map((r) => Number(r.id))],
        transaction,
      });
      size = grown.size;
      root = rootFromFrontier(h, grown.frontier);
      await sequelize.query(
        `UPDATE audit_log_state SET tree_size = $1, root_hash = decode($2, 'hex'), frontier = decode($3, 'hex'),
                integrated_at = now()`,
        { bind: [size, toHex(root), grown.frontier.map(toHex).join('')], transaction },
      );
    }
    let head: SignedHead | null = null;
    if (opts.signer) {
      const [last] = await q<{ tree_size: number; signed_ms: number }>(
        'SELECT tree_size, signed_ms FROM audit_log_heads ORDER BY tree_size DESC LIMIT 1',
      );
      const now = Date.now();
      const due = last
        ? size > Number(last.tree_size) &&
          (opts.forceHead || now - Number(last.signed_ms) >= (opts.headIntervalMs ?? 60_000))
        : size > 0;
      if (due) {
        // never earlier than the head before it, whatever this process's clock says
        const timestamp = Math.max(now, last ? Number(last.signed_ms) + 1 : 0);
        head = opts.signer.signHead(size, timestamp, root);
        await sequelize.query(
          `INSERT INTO audit_log_heads (tree_size, root_hash, signed_at, signed_ms, key_id, public_key, signature)
           VALUES ($1, decode($2, 'hex'), to_timestamp($3::double precision / 1000), $3, $4, decode($5, 'hex'),
                   decode($6, 'base64'))`,
          {
            bind: [size, head.rootHash, timestamp, head.keyId, toHex(opts.signer.raw), head.signature],
            transaction,
          },
        );
      }
    }
    return { ran: true, integrated: rows.length, treeSize: size, more: rows.length === batch, head };
  });
}

/**
 * Passes until the queue holds nothing this process can see (tests, the CLI, a receipt that needs
 * its event placed now). Waits for the lock rather than skipping.
 */
export async function integrateAll(
  sequelize: Sequelize,
  opts: SequencerOptions & { forceHead?: boolean } = {},
): Promise<PassResult> {
  let total = 0;
  for (;;) {
    const r = await integratePass(sequelize, { ...opts, wait: true });
    total += r.integrated;
    if (!r.more) return { ...r, integrated: total };
  }
}

/** The background loop every API process runs; the advisory lock lets one of them work at a time. */
export class LedgerWorker {
  private timer: NodeJS.Timeout | null = null;
  private running = false;
  private ticking: Promise<void> | null = null;

  constructor(
    private readonly sequelize: Sequelize,
    private readonly opts: SequencerOptions & { pollMs?: number } = {},
  ) {}

  start() {
    if (this.running) return;
    this.running = true;
    const loop = () => {
      if (!this.running) return;
      this.ticking = this.tick()
        .catch((err) => console.error('[ledger] sequencer:', (err as Error).message))
        .finally(() => {
          this.ticking = null;
          if (this.running) this.timer = setTimeout(loop, this.opts.pollMs ?? 250);
        });
    };
    loop();
  }

  private async tick() {
    for (let i = 0; i < 50 && this.running; i++) {
      const r = await integratePass(this.sequelize, this.opts);
      if (!r.more) return;
    }
  }

  async stop() {
    this.running = false;
    if (this.timer) clearTimeout(this.timer);
    await this.ticking;
  }
}
