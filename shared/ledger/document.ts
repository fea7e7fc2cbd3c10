// A document that anyone can check offline against the plant's signed log: its content, the audit
// event that recorded it, that event's place in the log, the audit path and the signed head. The
// verify command and the /verify page both run `verifyDocument` and `verifyCode`.
import { z } from 'zod';
import { decodeInclusionCode } from './code.js';
import { contentHash, entryLeafHash, entryText, type LogEntry } from './entry.js';
import { checkHead, type PublishedKey, type SignedHead } from './head.js';
import {
  equalBytes,
  fromHex,
  rfc6962,
  rootFromInclusionProof,
  toHex,
  verifyConsistency,
  verifyInclusion,
} from './merkle.js';

export const DOCUMENT_FORMAT = 'coretrail-document/1';

const hex32 = z.string().regex(/^[0-9a-f]{64}$/, 'a SHA-256 hash in lower-case hex');

export const signedHeadSchema = z.object({
  treeSize: z.number().int().nonnegative(),
  rootHash: hex32,
  timestamp: z.number().int().nonnegative(),
  keyId: hex32,
  signature: z.string().min(1).max(200),
});

export const logEntrySchema = z.object({
  id: z.number().int().positive(),
  occurredAt: z.string(),
  actorId: z.number().int().nullable(),
  actorRole: z.string().nullable(),
  action: z.string(),
  entity: z.string(),
  entityId: z.string(),
  before: z.unknown(),
  after: z.unknown(),
  requestId: z.string().nullable(),
});

export const documentSchema = z.object({
  format: z.literal(DOCUMENT_FORMAT),
  content: z.unknown(),
  entry: logEntrySchema,
  leafIndex: z.number().int().nonnegative(),
  treeSize: z.number().int().positive(),
  rootHash: hex32,
  proof: z.array(hex32).max(64),
  head: signedHeadSchema,
  code: z.string().max(4000).optional(),
});

export type CheckableDocument = z.infer<typeof documentSchema>;

/**
 * intact: the content is what the log recorded, the record is in the log, the head is the plant's.
 * altered: something was changed after it was logged (content, entry or head).
 * not_in_log: the record as given is not in the plant's log.
 * unknown: signed by a key that is not this plant's, so nothing can be said.
 * unreadable: not a document or code this checker knows.
 */
export type Verdict = 'intact' | 'altered' | 'not_in_log' | 'unknown' | 'unreadable';

export type VerifyResult = {
  verdict: Verdict;
  reason: string;
  leafIndex?: number;
  treeSize?: number;
  signedAt?: string;
};

/** The content hash an entry vouches for: `after.contentHash` of a `document.issued` event. */
function loggedContentHash(entry: LogEntry): string | null {
  const after = entry.after as { contentHash?: unknown } | null;
  return after && typeof after === 'object' && typeof after.contentHash === 'string' ? after.contentHash : null;
}

/** Does the document's content match its entry? A content hash where one was logged, else the `after` itself. */
function contentMatches(doc: CheckableDocument): boolean {
  const logged = loggedContentHash(doc.entry);
  if (logged !== null) return contentHash(doc.content) === logged;
  return entryText({ ...doc.entry, after: doc.content }) === entryText(doc.entry);
}

export function verifyDocument(input: unknown, keys: PublishedKey[]): VerifyResult {
  const parsed = documentSchema.safeParse(input);
  if (!parsed.success) {
    return { verdict: 'unreadable', reason: `not a ${DOCUMENT_FORMAT} file: ${parsed.error.issues[0]?.message}` };
  }
  const doc = parsed.data;
  const where = {
    leafIndex: doc.leafIndex,
    treeSize: doc.treeSize,
    signedAt: new Date(doc.head.timestamp).toISOString(),
  };
  const head = checkHead(doc.head as SignedHead, keys);
  if (head === 'unknown_key') {
    return { verdict: 'unknown', reason: "its log head is signed with a key that is not this plant's", ...where };
  }
  if (head === 'bad_signature') {
    return { verdict: 'altered', reason: "its log head does not match the plant's signature", ...where };
  }
  if (doc.head.treeSize !== doc.treeSize || doc.head.rootHash !== doc.rootHash) {
    return { verdict: 'altered', reason: 'its tree size or root differs from its signed log head', ...where };
  }
  if (!contentMatches(doc)) {
    return { verdict: 'altered', reason: 'its content differs from what the log recorded for it', ...where };
  }
  const root = fromHex(doc.rootHash);
  const proof = doc.proof.map(fromHex);
  if (verifyInclusion(rfc6962, doc.leafIndex, doc.treeSize, entryLeafHash(doc.entry), proof, root)) {
    return { verdict: 'intact', reason: `entry ${doc.leafIndex + 1} of a log of ${doc.treeSize}`, ...where };
  }
  // the code printed with the document names the leaf the log holds at that place
  if (doc.code) {
    try {
      const c = decodeInclusionCode(doc.code);
      if (
        c.leafIndex === doc.leafIndex &&
        c.treeSize === doc.treeSize &&
        verifyInclusion(rfc6962, c.leafIndex, c.treeSize, c.leafHash, c.proof, root)
      ) {
        return {
          verdict: 'altered',
          reason: `the log holds a different record at entry ${doc.leafIndex + 1}: this one was changed`,
          ...where,
        };
      }
    } catch {
      // an unreadable code says nothing more
    }
  }
  return { verdict: 'not_in_log', reason: 'the record is not in the log under its signed head', ...where };
}

/**
 * A code (or a document's own head) against the plant's latest head: the root the code's path leads
 * to must be the latest root, or a tree the latest one provably extends (RFC 9162 consistency proof
 * from the code's size to the head's, which the caller fetches from the plant).
 */
export function verifyCode(
  code: string,
  latest: SignedHead,
  keys: PublishedKey[],
  consistency: string[] | null,
): VerifyResult {
  let c;
  try {
    c = decodeInclusionCode(code);
  } catch (err) {
    return { verdict: 'unreadable', reason: (err as Error).message };
  }
  const where = { leafIndex: c.leafIndex, treeSize: c.treeSize, signedAt: new Date(latest.timestamp).toISOString() };
  const head = checkHead(latest, keys);
  if (head !== 'valid') return { verdict: 'unknown', reason: "the plant's log head could not be checked", ...where };
  if (c.treeSize > latest.treeSize) {
    return { verdict: 'not_in_log', reason: 'the code names a log larger than the plant has published', ...where };
  }
  const root = rootFromInclusionProof(rfc6962, c.leafIndex, c.treeSize, c.leafHash, c.proof);
  const latestRoot = fromHex(latest.rootHash);
  const held =
    root !== null &&
    (c.treeSize === latest.treeSize
      ? equalBytes(root, latestRoot)
      : verifyConsistency(rfc6962, c.treeSize, latest.treeSize, (consistency ?? []).map(fromHex), root, latestRoot));
  return held
    ? {
        verdict: 'intact',
        reason: `entry ${c.leafIndex + 1} (leaf ${toHex(c.leafHash).slice(0, 12)}…) is in the plant's log of ${latest.treeSize}`,
        ...where,
      }
    : { verdict: 'not_in_log', reason: "the code does not lead to the plant's published log", ...where };
}

/** Does a document's own head sit in the plant's latest log? (The log was only appended to since.) */
export function headExtendsTo(
  older: { treeSize: number; rootHash: string },
  latest: SignedHead,
  consistency: string[],
): boolean {
  if (older.treeSize > latest.treeSize) return false;
  return verifyConsistency(
    rfc6962,
    older.treeSize,
    latest.treeSize,
    consistency.map(fromHex),
    fromHex(older.rootHash),
    fromHex(latest.rootHash),
  );
}
