// Checks the whole audit trail: the chained history, every leaf against its event, every stored
// subtree, the sequencer's state, every signed head (signature and root), and that no event is
// missing from both the tree and the queue.
import { QueryTypes, Transaction, type Sequelize } from 'sequelize';
import { entryBytes } from '../../shared/ledger/entry.js';
import { checkHead, fromBase64, keyIdOf, type SignedHead } from '../../shared/ledger/head.js';
import { appendLeaves, equalBytes, rootFromFrontier, toHex, type Hash } from '../../shared/ledger/merkle.js';
import type { AuditVerifyReport } from '../../shared/schemas/audit.js';
import { verifyAuditChain } from '../audit.js';
import { nodeHasher, type Signer } from './signer.js';
import { EVENT_COLUMNS, entryOf, headsPage, readState, type EventRow } from './store.js';

export async function logStatus(sequelize: Sequelize, signer: Signer | null, transaction?: Transaction) {
  const state = await readState(sequelize, transaction);
  const [pending] = await sequelize.query<{ n: number; oldest: Date | null }>(
    'SELECT count(*)::int AS n, min(queued_at) AS oldest FROM audit_pending',
    { type: QueryTypes.SELECT, transaction },
  );
  const [head] = await headsPageDesc(sequelize, transaction);
  return {
    treeSize: state.treeSize,
    rootHash: toHex(state.rootHash),
    integratedAt: state.integratedAt ? new Date(state.integratedAt).toISOString() : null,
    pending: pending?.n ?? 0,
    oldestPendingAt: pending?.oldest ? new Date(pending.oldest).toISOString() : null,
    latestHead: head ?? null,
    signing: signer ? { keyId: signer.keyId, publicKey: signer.publicKey } : null,
  };
}

async function headsPageDesc(sequelize: Sequelize, transaction?: Transaction): Promise<SignedHead[]> {
  const rows = await sequelize.query<{ tree_size: number }>(
    'SELECT tree_size FROM audit_log_heads ORDER BY tree_size DESC LIMIT 1',
    { type: QueryTypes.SELECT, transaction },
  );
  if (!rows[0]) return [];
  return headsPage(sequelize, Number(rows[0].tree_size) - 1, 1, transaction);
}

type Broken = { id: number | null; reason: string };

/** Everything is read in one REPEATABLE READ snapshot, so a sequencer pass during the walk changes nothing seen. */
export function verifyAudit(
  sequelize: Sequelize,
  opts: { signer?: Signer | null; batch?: number } = {},
): Promise<AuditVerifyReport> {
  return sequelize.transaction({ isolationLevel: Transaction.ISOLATION_LEVELS.REPEATABLE_READ }, (transaction) =>
    verifyIn(sequelize, transaction, opts),
  );
}

async function verifyIn(
  sequelize: Sequelize,
  transaction: Transaction,
  { signer = null, batch = 2000 }: { signer?: Signer | null; batch?: number },
): Promise<AuditVerifyReport> {
  const chain = await verifyAuditChain(sequelize, batch, transaction);
  const state = await readState(sequelize, transaction);
  const status = await logStatus(sequelize, signer, transaction);
  let firstBroken: Broken | null = chain.firstBroken;
  const problems: string[] = chain.firstBroken ? [`event ${chain.firstBroken.id}: ${chain.firstBroken.reason}`] : [];
  const fail = (b: Broken) => {
    firstBroken ??= b;
    if (problems.length < 20) problems.push(b.id === null ? b.reason : `event ${b.id}: ${b.reason}`);
  };

  // heads: every signature, in size order; roots checked as the walk reaches each size
  const heads: (SignedHead & { publicKey: string })[] = [];
  for (let after = -1; ;) {
    const page = await headsPage(sequelize, after, 5000, transaction);
    heads.push(...page);
    if (page.length < 5000) break;
    after = page[page.length - 1]!.treeSize;
  }
  let headsChecked = 0;
  for (const hd of heads) {
    const ownKey = keyIdOf(fromBase64(hd.publicKey)) === hd.keyId;
    if (!ownKey || checkHead(hd, [{ keyId: hd.keyId, publicKey: hd.publicKey }]) !== 'valid') {
      fail({ id: null, reason: `the signed head of size ${hd.treeSize} does not carry a valid signature` });
    } else if (signer && hd.keyId !== signer.keyId) {
      fail({ id: null, reason: `the head of size ${hd.treeSize} is signed with a key other than this plant's` });
    }
  }

  // the walk: leaves in order, each against its event, each finished subtree against the cache
  let size = 0;
  let frontier: Hash[] = [];
  let nodesChecked = 0;
  let headAt = 0;
  const checkHeadsUpTo = () => {
    while (headAt < heads.length && heads[headAt]!.treeSize <= size) {
      const hd = heads[headAt]!;
      if (hd.treeSize === size) {
        if (toHex(rootFromFrontier(nodeHasher, frontier)) !== hd.rootHash) {
          fail({ id: null, reason: `the log's first ${hd.treeSize} entries no longer have the root its head signed` });
        } else headsChecked += 1;
      }
      headAt += 1;
    }
  };
  checkHeadsUpTo();
  for (;;) {
    const rows = await sequelize.query<EventRow & { leaf_index: number; leaf_hash: Buffer; event_id: number }>(
      `SELECT l.leaf_index, l.leaf_hash, l.event_id, ${EVENT_COLUMNS}
         FROM audit_leaves l LEFT JOIN audit_events e ON e.id = l.event_id
        WHERE l.leaf_index >= $1 ORDER BY l.leaf_index LIMIT $2`,
      { type: QueryTypes.SELECT, bind: [size, batch], transaction },
    );
    if (!rows.length) break;
    const recomputed: Hash[] = [];
    for (const [i, r] of rows.entries()) {
      if (Number(r.leaf_index) !== size + i) {
        fail({ id: Number(r.event_id), reason: `the log has no entry ${size + i + 1}: its leaves are not contiguous` });
      }
      if (r.id === null) {
        fail({ id: Number(r.event_id), reason: 'its leaf is in the log but the event is gone' });
        recomputed.push(new Uint8Array(r.leaf_hash));
        continue;
      }
      const leaf = nodeHasher.leaf(entryBytes(entryOf(r)));
      if (!equalBytes(leaf, r.leaf_hash)) {
        fail({ id: Number(r.id), reason: 'its content does not match its leaf in the log' });
      }
      // the tree is rebuilt from the stored leaves, so one altered event is named once, not twice
      recomputed.push(new Uint8Array(r.leaf_hash));
    }
    // heads fall between batches as well as on their edges: append up to each one and check its root
    const finished: ReturnType<typeof appendLeaves>['nodes'] = [];
    for (let i = 0; i < recomputed.length;) {
      const next = heads[headAt]?.treeSize ?? Infinity;
      const step = Math.min(recomputed.length - i, Math.max(1, next - size));
      const part = appendLeaves(nodeHasher, size, frontier, recomputed.slice(i, i + step));
      finished.push(...part.nodes);
      size = part.size;
      frontier = part.frontier;
      i += step;
      checkHeadsUpTo();
    }
    if (finished.length) {
      const stored = await sequelize.query<{ level: number; node_index: number; hash: Buffer }>(
        `SELECT n.level, n.node_index, n.hash FROM audit_tree_nodes n
           JOIN unnest($1::int[], $2::bigint[]) AS w(level, idx) ON n.level = w.level AND n.node_index = w.idx`,
        { type: QueryTypes.SELECT, bind: [finished.map((n) => n.level), finished.map((n) => n.index)], transaction },
      );
      const byId = new Map(stored.map((x) => [`${x.level}:${Number(x.node_index)}`, x.hash]));
      for (const n of finished) {
        const x = byId.get(`${n.level}:${n.index}`);
        if (!x || !equalBytes(x, n.hash)) {
          fail({ id: null, reason: `the stored subtree ${n.level}:${n.index} does not match the leaves under it` });
        } else nodesChecked += 1;
      }
    }
  }
  const beyond = heads.find((hd) => hd.treeSize > size);
  if (beyond)
    fail({ id: null, reason: `a head was signed at size ${beyond.treeSize} but the log holds ${size} entries` });
  if (size !== state.treeSize)
    fail({ id: null, reason: `the state says ${state.treeSize} entries, the leaves ${size}` });
  if (!equalBytes(rootFromFrontier(nodeHasher, frontier), state.rootHash)) {
    fail({ id: null, reason: "the sequencer's stored root does not match the leaves" });
  }
  const [counts] = await sequelize.query<{
    nodes: number;
    missing: number;
    twice: number;
    first_missing: number | null;
  }>(
    `SELECT (SELECT count(*)::int FROM audit_tree_nodes) AS nodes,
            count(*) FILTER (WHERE l.event_id IS NULL AND p.event_id IS NULL)::int AS missing,
            count(*) FILTER (WHERE l.event_id IS NOT NULL AND p.event_id IS NOT NULL)::int AS twice,
            min(e.id) FILTER (WHERE l.event_id IS NULL AND p.event_id IS NULL) AS first_missing
       FROM audit_events e
       LEFT JOIN audit_leaves l ON l.event_id = e.id
       LEFT JOIN audit_pending p ON p.event_id = e.id`,
    { type: QueryTypes.SELECT, transaction },
  );
  if (counts && counts.missing > 0) {
    fail({
      id: Number(counts.first_missing),
      reason: 'it is neither in the log nor waiting for it (its queue row was removed)',
    });
  }
  if (counts && counts.twice > 0) fail({ id: null, reason: `${counts.twice} events are in the log and still queued` });
  if (counts && counts.nodes !== nodesChecked) {
    fail({ id: null, reason: `the tree holds ${counts.nodes} subtrees where its leaves make ${nodesChecked}` });
  }
  return {
    ok: firstBroken === null,
    checked: size,
    firstBroken,
    problems,
    chain: { checked: chain.checked },
    log: status,
    heads: { checked: headsChecked, total: heads.length },
  };
}
