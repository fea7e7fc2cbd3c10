// What a document carries to be checked offline: its entry, the entry's leaf, the audit path to a
// signed head's root and the compact code. The lead's PDFs embed the same (`documentCode`).
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { encodeInclusionCode } from '../../shared/ledger/code.js';
import { DOCUMENT_FORMAT, type CheckableDocument } from '../../shared/ledger/document.js';
import { contentHash, type LogEntry } from '../../shared/ledger/entry.js';
import type { SignedHead } from '../../shared/ledger/head.js';
import { inclusionProof, toHex, consistencyProof } from '../../shared/ledger/merkle.js';
import { recordAuditReturningId, type Ctx } from '../audit.js';
import { AppError, notFound } from '../errors.js';
import { integrateAll, type SequencerOptions } from './sequencer.js';
import { nodeHasher } from './signer.js';
import { EVENT_COLUMNS, entryOf, headCovering, readState, withStoredNodes, type EventRow } from './store.js';

export type Receipt = {
  eventId: number;
  entry: LogEntry;
  leafIndex: number;
  leafHash: string;
  treeSize: number;
  rootHash: string;
  proof: string[];
  head: SignedHead;
  code: string;
};

const notYet = (message: string) => new AppError('not_yet_in_log', message);

async function leafOf(sequelize: Sequelize, eventId: number) {
  const [row] = await sequelize.query<EventRow & { leaf_index: number | null; leaf_hash: Buffer | null }>(
    `SELECT ${EVENT_COLUMNS}, l.leaf_index, l.leaf_hash
       FROM audit_events e LEFT JOIN audit_leaves l ON l.event_id = e.id WHERE e.id = $1`,
    { type: QueryTypes.SELECT, bind: [eventId] },
  );
  return row;
}

/**
 * The receipt of one audit event against the newest signed head that covers it. An event not yet
 * placed, or placed after the newest head, is placed and a head signed on the spot (the sequencer's
 * lock keeps that to one writer), so a receipt never waits for the next interval.
 */
export async function receiptFor(sequelize: Sequelize, eventId: number, opts: SequencerOptions): Promise<Receipt> {
  let row = await leafOf(sequelize, eventId);
  if (!row) throw notFound('That audit event');
  let head = row.leaf_index === null ? null : await headCovering(sequelize, Number(row.leaf_index));
  if (!head) {
    if (!opts.signer) throw notYet('This server has no signing key (AUDIT_SIGNING_KEY), so it signs no log heads.');
    await integrateAll(sequelize, { ...opts, forceHead: true });
    row = (await leafOf(sequelize, eventId))!;
    if (row.leaf_index === null) throw notYet('That event is not in the log yet. Try again in a moment.');
    head = await headCovering(sequelize, Number(row.leaf_index));
    if (!head) throw notYet('No signed log head covers that event yet. Try again in a moment.');
  }
  const leafIndex = Number(row.leaf_index);
  const size = head.treeSize;
  const proof = await withStoredNodes(sequelize, (get) => inclusionProof(nodeHasher, get, leafIndex, size));
  const leafHash = new Uint8Array(row.leaf_hash!);
  return {
    eventId,
    entry: entryOf(row),
    leafIndex,
    leafHash: toHex(leafHash),
    treeSize: size,
    rootHash: head.rootHash,
    proof: proof.map(toHex),
    head,
    code: encodeInclusionCode({ leafIndex, treeSize: size, leafHash, proof }),
  };
}

/** The compact code (text and QR) for one audit event: leaf index, tree size, leaf hash and path. */
export async function documentCode(sequelize: Sequelize, eventId: number, opts: SequencerOptions): Promise<string> {
  return (await receiptFor(sequelize, eventId, opts)).code;
}

/** A checkable document: the content and the receipt of the event that logged it. */
export async function documentFor(
  sequelize: Sequelize,
  eventId: number,
  content: unknown,
  opts: SequencerOptions,
): Promise<CheckableDocument> {
  const r = await receiptFor(sequelize, eventId, opts);
  return {
    format: DOCUMENT_FORMAT,
    content,
    entry: r.entry,
    leafIndex: r.leafIndex,
    treeSize: r.treeSize,
    rootHash: r.rootHash,
    proof: r.proof,
    head: r.head,
    code: r.code,
  };
}

/**
 * Logs that a document was issued, in the caller's transaction: a `document.issued` event whose
 * `after` holds the SHA-256 of the document's canonical content. Returns the event's id for
 * `documentFor` / `documentCode` once it has committed.
 */
export async function recordDocument(
  ctx: Ctx,
  transaction: Transaction,
  doc: { kind: string; entity: string; entityId: string | number; title?: string; content: unknown },
): Promise<{ eventId: number; contentHash: string }> {
  const hash = contentHash(doc.content);
  const eventId = await recordAuditReturningId(ctx, transaction, {
    action: 'document.issued',
    entity: doc.entity,
    entityId: doc.entityId,
    after: { kind: doc.kind, title: doc.title ?? null, contentHash: hash },
  });
  return { eventId, contentHash: hash };
}

/** RFC 9162 consistency proof between two sizes of the integrated tree. */
export async function consistencyBetween(sequelize: Sequelize, from: number, to: number) {
  const { treeSize } = await readState(sequelize);
  if (from > to) throw new AppError('invalid', 'from must not be larger than to.', { from: 'larger than to' });
  if (to > treeSize) {
    throw new AppError('invalid', `The log holds ${treeSize} entries; to must not be larger.`, {
      to: `at most ${treeSize}`,
    });
  }
  const proof = await withStoredNodes(sequelize, (get) => consistencyProof(nodeHasher, get, from, to));
  return { from, to, proof: proof.map(toHex) };
}
