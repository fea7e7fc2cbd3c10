// The compact code a printed document carries (as text and in its QR): where its entry sits in the
// log and the audit path to the root. Binary, then RFC 4648 base32 so that a QR code can hold it
// in alphanumeric mode (upper-case letters, digits and ':'):
//
//   "CT1:" base32( uvarint leafIndex ‖ uvarint treeSize ‖ leafHash[32] ‖ path[32 × k] ‖ check[4] )
//
// k follows from leafIndex and treeSize (RFC 9162 §2.1.3.1), so it is not stored; check is the first
// four bytes of SHA-256 over everything before it, so a mistyped code reads as mistyped rather than
// as "not in the log". The leaf hash lets a code alone be checked against the published log.
import { sha256 } from '@noble/hashes/sha2.js';
import { equalBytes, splitPoint, type Hash } from './merkle.js';

export const CODE_PREFIX = 'CT1:';

export type InclusionCode = { leafIndex: number; treeSize: number; leafHash: Hash; proof: Hash[] };

/** How many hashes the audit path of leaf m in a tree of n has. */
export function pathLength(m: number, n: number): number {
  let len = 0;
  let a = 0;
  let b = n;
  while (b - a > 1) {
    const k = splitPoint(b - a);
    if (m - a < k) b = a + k;
    else a += k;
    len += 1;
  }
  return len;
}

function putVarint(out: number[], v: number) {
  if (!Number.isSafeInteger(v) || v < 0) throw new RangeError('a varint is a non-negative safe integer');
  while (v >= 0x80) {
    out.push((v % 0x80) | 0x80);
    v = Math.floor(v / 0x80);
  }
  out.push(v);
}

function getVarint(b: Uint8Array, at: { i: number }): number {
  let v = 0;
  let mul = 1;
  for (let n = 0; n < 8; n++) {
    const byte = b[at.i++];
    if (byte === undefined) throw new Error('the code ends too soon');
    v += (byte & 0x7f) * mul;
    if (!(byte & 0x80)) return v;
    mul *= 0x80;
  }
  throw new Error('a number in the code is too long');
}

const B32 = 'ABCDEFGHIJKLMNOPQRSTUVWXYZ234567';

export function base32(bytes: Uint8Array): string {
  let out = '';
  let bits = 0;
  let acc = 0;
  for (const v of bytes) {
    acc = (acc << 8) | v;
    bits += 8;
    while (bits >= 5) {
      out += B32[(acc >>> (bits - 5)) & 31];
      bits -= 5;
    }
    acc &= (1 << bits) - 1;
  }
  if (bits > 0) out += B32[(acc << (5 - bits)) & 31];
  return out;
}

export function unbase32(text: string): Uint8Array {
  const out: number[] = [];
  let bits = 0;
  let acc = 0;
  for (const ch of text) {
    const v = B32.indexOf(ch);
    if (v < 0) throw new Error(`"${ch}" is not a character of the code`);
    acc = (acc << 5) | v;
    bits += 5;
    if (bits >= 8) {
      out.push((acc >>> (bits - 8)) & 0xff);
      bits -= 8;
    }
    acc &= (1 << bits) - 1;
  }
  return Uint8Array.from(out);
}

export function encodeInclusionCode(c: InclusionCode): string {
  if (c.leafHash.length !== 32 || c.proof.some((p) => p.length !== 32)) throw new Error('hashes are 32 bytes');
  if (c.leafIndex >= c.treeSize) throw new RangeError('the leaf is not in a tree of that size');
  if (c.proof.length !== pathLength(c.leafIndex, c.treeSize)) throw new Error('the path has the wrong length');
  const head: number[] = [];
  putVarint(head, c.leafIndex);
  putVarint(head, c.treeSize);
  const body = new Uint8Array(head.length + 32 * (1 + c.proof.length) + 4);
  body.set(head, 0);
  body.set(c.leafHash, head.length);
  c.proof.forEach((p, i) => body.set(p, head.length + 32 * (i + 1)));
  const end = body.length - 4;
  body.set(sha256(body.subarray(0, end)).subarray(0, 4), end);
  return CODE_PREFIX + base32(body);
}

/** Reads a code, forgiving spaces, line breaks and lower case; throws with a plain reason otherwise. */
export function decodeInclusionCode(text: string): InclusionCode {
  const t = text.replace(/\s+/g, '').toUpperCase();
  if (!t.startsWith(CODE_PREFIX)) throw new Error(`a Coretrail code starts with ${CODE_PREFIX}`);
  const body = unbase32(t.slice(CODE_PREFIX.length));
  if (body.length < 4 + 2 + 32) throw new Error('the code is too short');
  const end = body.length - 4;
  if (!equalBytes(sha256(body.subarray(0, end)).subarray(0, 4), body.subarray(end))) {
    throw new Error('the code is mistyped or incomplete (its check does not match)');
  }
  const at = { i: 0 };
  const leafIndex = getVarint(body, at);
  const treeSize = getVarint(body, at);
  if (leafIndex >= treeSize) throw new Error('the code names a position outside its tree');
  const k = pathLength(leafIndex, treeSize);
  if (end - at.i !== 32 * (1 + k)) throw new Error('the code has the wrong length for its tree');
  const hashAt = (j: number) => body.slice(at.i + 32 * j, at.i + 32 * (j + 1));
  return { leafIndex, treeSize, leafHash: hashAt(0), proof: Array.from({ length: k }, (_, j) => hashAt(j + 1)) };
}
