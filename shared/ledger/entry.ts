// What one audit event is as a leaf of the log: the UTF-8 bytes of its RFC 8785 canonical JSON.
// The server hashes a stored row this way when it integrates it; a verifier hashes a document's
// copy of the same event the same way, in Node or in the browser.
import { sha256 } from '@noble/hashes/sha2.js';
import canonicalize from 'canonicalize';
import { rfc6962, toHex, type Hash, type Hasher } from './merkle.js';

/** One audit event as the log holds it. `id` ties the leaf to its row; times are ISO 8601 UTC. */
export type LogEntry = {
  id: number;
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

const FIELDS = [
  'id',
  'occurredAt',
  'actorId',
  'actorRole',
  'action',
  'entity',
  'entityId',
  'before',
  'after',
  'requestId',
] as const;

/** The canonical JSON text of an entry; fields beyond the ten of `LogEntry` are not part of it. */
export function entryText(e: LogEntry): string {
  const picked: Record<string, unknown> = {};
  for (const k of FIELDS) picked[k] = e[k] ?? null;
  return canonicalize(picked) ?? '';
}

export const entryBytes = (e: LogEntry): Uint8Array => new TextEncoder().encode(entryText(e));

/** The entry's leaf hash, SHA-256(0x00 ‖ canonical JSON). */
export const entryLeafHash = (e: LogEntry, h: Hasher = rfc6962): Hash => h.leaf(entryBytes(e));

/** Canonical JSON of a document's content: what its `contentHash` is taken over. */
export function contentText(content: unknown): string {
  const text = canonicalize(content);
  if (text === undefined) throw new Error('the content is not JSON');
  return text;
}

/** SHA-256 (hex) of a document's canonical content. */
export const contentHash = (content: unknown): string => toHex(sha256(new TextEncoder().encode(contentText(content))));
