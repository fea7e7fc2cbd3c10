// A signed log head: the tree size and root hash at a time, signed with the plant's Ed25519 key.
// The signed bytes are RFC 6962 §3.5's TreeHeadSignature: version v1 (0), signature type
// tree_hash (1), timestamp (uint64, ms since the epoch), tree_size (uint64), sha256_root_hash.
// The key is named as RFC 6962 §3.2 names a log: SHA-256 of its DER SubjectPublicKeyInfo.
import * as ed from '@noble/ed25519';
import { sha256, sha512 } from '@noble/hashes/sha2.js';
import { fromHex, toHex } from './merkle.js';

ed.hashes.sha512 = sha512;

export type SignedHead = {
  treeSize: number;
  /** hex */
  rootHash: string;
  /** ms since 1970-01-01 UTC */
  timestamp: number;
  /** hex SHA-256 of the signing key's SubjectPublicKeyInfo */
  keyId: string;
  /** base64 Ed25519 signature over `headMessage` */
  signature: string;
};

/** A plant's public key as the server publishes it. */
export type PublishedKey = { keyId: string; publicKey: string };

// RFC 8410 §4: the DER SubjectPublicKeyInfo of an Ed25519 key is this prefix and the 32 key bytes
const SPKI_PREFIX = fromHex('302a300506032b6570032100');

export function spkiOf(rawPublicKey: Uint8Array): Uint8Array {
  if (rawPublicKey.length !== 32) throw new Error('an Ed25519 public key is 32 bytes');
  const out = new Uint8Array(SPKI_PREFIX.length + 32);
  out.set(SPKI_PREFIX);
  out.set(rawPublicKey, SPKI_PREFIX.length);
  return out;
}

export const keyIdOf = (rawPublicKey: Uint8Array): string => toHex(sha256(spkiOf(rawPublicKey)));

function u64(view: DataView, at: number, v: number) {
  view.setBigUint64(at, BigInt(v));
}

/** The 50 bytes a head's signature covers. */
export function headMessage(treeSize: number, timestamp: number, rootHash: Uint8Array): Uint8Array {
  if (rootHash.length !== 32) throw new Error('a root hash is 32 bytes');
  const out = new Uint8Array(50);
  const view = new DataView(out.buffer);
  out[0] = 0; // Version v1
  out[1] = 1; // SignatureType tree_hash
  u64(view, 2, timestamp);
  u64(view, 10, treeSize);
  out.set(rootHash, 18);
  return out;
}

export function toBase64(b: Uint8Array): string {
  let s = '';
  for (const v of b) s += String.fromCharCode(v);
  return btoa(s);
}
export function fromBase64(s: string): Uint8Array {
  const bin = atob(s);
  const out = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) out[i] = bin.charCodeAt(i);
  return out;
}

/** RFC 8032 verification (the strict rules, not ZIP 215), as OpenSSL signs. */
export function ed25519Verify(signature: Uint8Array, message: Uint8Array, rawPublicKey: Uint8Array): boolean {
  if (signature.length !== 64 || rawPublicKey.length !== 32) return false;
  try {
    return ed.verify(signature, message, rawPublicKey, { zip215: false });
  } catch {
    return false;
  }
}

export type HeadCheck = 'valid' | 'unknown_key' | 'bad_signature';

/** Is this head signed by one of the given keys? An unknown key id is not a bad signature. */
export function checkHead(head: SignedHead, keys: PublishedKey[]): HeadCheck {
  const key = keys.find((k) => k.keyId === head.keyId);
  if (!key) return 'unknown_key';
  try {
    const raw = fromBase64(key.publicKey);
    if (keyIdOf(raw) !== head.keyId) return 'unknown_key';
    const ok = ed25519Verify(
      fromBase64(head.signature),
      headMessage(head.treeSize, head.timestamp, fromHex(head.rootHash)),
      raw,
    );
    return ok ? 'valid' : 'bad_signature';
  } catch {
    return 'bad_signature';
  }
}
