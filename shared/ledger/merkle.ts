// The Merkle tree of an append-only log as RFC 6962 §2.1 and RFC 9162 §2.1 define it: leaf hashes
// SHA-256(0x00 ‖ d), interior nodes SHA-256(0x01 ‖ left ‖ right), the left subtree of n leaves
// holding the largest power of two below n. Pure code for both sides: the server builds proofs, the
// browser and the verify command check them. Sizes and indexes are plain numbers (exact to 2^53).
import { sha256 } from '@noble/hashes/sha2.js';

export type Hash = Uint8Array;

export interface Hasher {
  /** MTH({}) : the hash of an empty string. */
  empty(): Hash;
  /** MTH({d}) = HASH(0x00 ‖ d). */
  leaf(data: Uint8Array): Hash;
  /** HASH(0x01 ‖ left ‖ right). */
  node(left: Hash, right: Hash): Hash;
}

/** A hasher over any SHA-256 implementation: the server hands in node:crypto's, which is faster. */
export function makeHasher(digest: (bytes: Uint8Array) => Uint8Array): Hasher {
  return {
    empty: () => digest(new Uint8Array(0)),
    leaf(data) {
      const b = new Uint8Array(data.length + 1);
      b[0] = 0x00;
      b.set(data, 1);
      return digest(b);
    },
    node(left, right) {
      const b = new Uint8Array(1 + left.length + right.length);
      b[0] = 0x01;
      b.set(left, 1);
      b.set(right, 1 + left.length);
      return digest(b);
    },
  };
}

/** RFC 6962 hashing on @noble/hashes: the same bytes in the browser and in Node. */
export const rfc6962: Hasher = makeHasher((b) => sha256(b));

const isPow2 = (n: number) => n > 0 && 2 ** Math.floor(Math.log2(n)) === n;

/** The largest power of two strictly smaller than n (n ≥ 2): the RFC's split point k. */
export function splitPoint(n: number): number {
  if (n < 2) throw new RangeError('a tree of fewer than two leaves does not split');
  let k = 2 ** Math.floor(Math.log2(n));
  if (k === n) k /= 2;
  // Math.log2 of a number just below a power of two can round up: correct for it
  while (k >= n) k /= 2;
  while (k * 2 < n) k *= 2;
  return k;
}

/**
 * A complete subtree of 2^level leaves, covering leaves [index · 2^level, (index + 1) · 2^level).
 * Once the log holds all of them, its hash never changes, so it can be stored and looked up.
 */
export type NodeId = { level: number; index: number };

/** Where a proof builder gets the hash of a complete subtree (a leaf hash at level 0). */
export type NodeSource = (level: number, index: number) => Hash;

/** MTH(D[start:end]) from complete subtrees, splitting as §2.1.1 does. Every range a proof asks for is aligned. */
export function rangeHash(h: Hasher, get: NodeSource, start: number, end: number): Hash {
  const n = end - start;
  if (n <= 0) throw new RangeError('an empty range has no subtree hash');
  if (isPow2(n) && start % n === 0) return get(Math.log2(n), start / n);
  const k = splitPoint(n);
  return h.node(rangeHash(h, get, start, start + k), rangeHash(h, get, start + k, end));
}

/** MTH(D[0:n]): the root of a tree of n leaves (the empty hash for n = 0). */
export function rootHash(h: Hasher, get: NodeSource, size: number): Hash {
  return size === 0 ? h.empty() : rangeHash(h, get, 0, size);
}

/** MTH of a list of leaf hashes, straight from §2.1.1 (tests, and the browser's small checks). */
export function treeHashOfLeaves(h: Hasher, leafHashes: Hash[]): Hash {
  return rootHash(h, leafSource(h, leafHashes), leafHashes.length);
}

/** A NodeSource over leaf hashes held in memory: complete subtrees computed on demand and kept. */
export function leafSource(h: Hasher, leafHashes: Hash[]): NodeSource {
  const memo = new Map<string, Hash>();
  const get: NodeSource = (level, index) => {
    if (level === 0) {
      const leaf = leafHashes[index];
      if (!leaf) throw new RangeError(`no leaf ${index}`);
      return leaf;
    }
    const key = `${level}:${index}`;
    let v = memo.get(key);
    if (!v) {
      v = h.node(get(level - 1, index * 2), get(level - 1, index * 2 + 1));
      memo.set(key, v);
    }
    return v;
  };
  return get;
}

function checkInclusionArgs(index: number, size: number) {
  if (!Number.isSafeInteger(index) || !Number.isSafeInteger(size) || index < 0 || index >= size) {
    throw new RangeError(`leaf ${index} is not in a tree of ${size}`);
  }
}

/** PATH(m, D[0:n]) of RFC 9162 §2.1.3.1: the audit path of leaf m, nearest the leaf first. */
export function inclusionProof(h: Hasher, get: NodeSource, index: number, size: number): Hash[] {
  checkInclusionArgs(index, size);
  const path = (m: number, a: number, b: number): Hash[] => {
    const n = b - a;
    if (n === 1) return [];
    const k = splitPoint(n);
    return m - a < k
      ? [...path(m, a, a + k), rangeHash(h, get, a + k, b)]
      : [...path(m, a + k, b), rangeHash(h, get, a, a + k)];
  };
  return path(index, 0, size);
}

/** PROOF(m, D[0:n]) of RFC 9162 §2.1.4.1: shows that the tree of size m is a prefix of the tree of size n. */
export function consistencyProof(h: Hasher, get: NodeSource, first: number, second: number): Hash[] {
  if (!Number.isSafeInteger(first) || !Number.isSafeInteger(second) || first < 0 || first > second) {
    throw new RangeError(`no consistency proof from ${first} to ${second}`);
  }
  if (first === 0 || first === second) return [];
  const sub = (m: number, a: number, b: number, whole: boolean): Hash[] => {
    const n = b - a;
    if (m === n) return whole ? [] : [rangeHash(h, get, a, b)];
    const k = splitPoint(n);
    return m <= k
      ? [...sub(m, a, a + k, whole), rangeHash(h, get, a + k, b)]
      : [...sub(m - k, a + k, b, false), rangeHash(h, get, a, a + k)];
  };
  return sub(first, 0, second, true);
}

/**
 * The complete subtrees a builder will ask for, found by running it once with a stand-in source.
 * The server fetches exactly these from its node cache, in one query, then runs the builder again.
 */
export function nodesNeeded(build: (get: NodeSource) => unknown): NodeId[] {
  const seen = new Map<string, NodeId>();
  const blank = new Uint8Array(32);
  build((level, index) => {
    seen.set(`${level}:${index}`, { level, index });
    return blank;
  });
  return [...seen.values()];
}

export const equalBytes = (a: Uint8Array, b: Uint8Array) => a.length === b.length && a.every((v, i) => v === b[i]);

const lsb = (x: number) => x % 2 === 1;
const half = (x: number) => Math.floor(x / 2);

/** The root that an inclusion proof leads to (RFC 9162 §2.1.3.2), or null when the proof cannot hold. */
export function rootFromInclusionProof(
  h: Hasher,
  index: number,
  size: number,
  leafHash: Hash,
  proof: Hash[],
): Hash | null {
  if (!Number.isSafeInteger(index) || !Number.isSafeInteger(size) || index < 0 || index >= size) return null;
  if (leafHash.length !== 32 || proof.some((p) => p.length !== 32)) return null;
  let fn = index;
  let sn = size - 1;
  let r = leafHash;
  for (const p of proof) {
    if (sn === 0) return null;
    if (lsb(fn) || fn === sn) {
      r = h.node(p, r);
      if (!lsb(fn)) {
        while (!lsb(fn) && fn !== 0) {
          fn = half(fn);
          sn = half(sn);
        }
      }
    } else {
      r = h.node(r, p);
    }
    fn = half(fn);
    sn = half(sn);
  }
  return sn === 0 ? r : null;
}

/** RFC 9162 §2.1.3.2: does `proof` show leaf `index` with this hash in the tree of `size` with this root? */
export function verifyInclusion(
  h: Hasher,
  index: number,
  size: number,
  leafHash: Hash,
  proof: Hash[],
  root: Hash,
): boolean {
  const r = rootFromInclusionProof(h, index, size, leafHash, proof);
  return r !== null && equalBytes(r, root);
}

/** RFC 9162 §2.1.4.2: does `proof` show the tree (first, firstRoot) is a prefix of (second, secondRoot)? */
export function verifyConsistency(
  h: Hasher,
  first: number,
  second: number,
  proof: Hash[],
  firstRoot: Hash,
  secondRoot: Hash,
): boolean {
  if (!Number.isSafeInteger(first) || !Number.isSafeInteger(second) || first < 0 || first > second) return false;
  if (first === second) return proof.length === 0 && equalBytes(firstRoot, secondRoot);
  // every tree extends the empty one, and there is nothing to prove
  if (first === 0) return proof.length === 0;
  if (proof.length === 0 || proof.some((p) => p.length !== 32)) return false;
  const path = isPow2(first) ? [firstRoot, ...proof] : [...proof];
  let fn = first - 1;
  let sn = second - 1;
  while (lsb(fn)) {
    fn = half(fn);
    sn = half(sn);
  }
  let fr = path[0]!;
  let sr = path[0]!;
  for (const c of path.slice(1)) {
    if (sn === 0) return false;
    if (lsb(fn) || fn === sn) {
      fr = h.node(c, fr);
      sr = h.node(c, sr);
      if (!lsb(fn)) {
        while (!lsb(fn) && fn !== 0) {
          fn = half(fn);
          sn = half(sn);
        }
      }
    } else {
      sr = h.node(sr, c);
    }
    fn = half(fn);
    sn = half(sn);
  }
  return sn === 0 && equalBytes(fr, firstRoot) && equalBytes(sr, secondRoot);
}

/**
 * The complete subtrees that make up a tree of `size` leaves, largest (leftmost) first: the "right
 * frontier" an appender keeps. Appending a leaf merges equal-sized trailing subtrees.
 */
export function frontier(size: number): NodeId[] {
  const out: NodeId[] = [];
  let start = 0;
  for (let level = 52; level >= 0; level--) {
    const w = 2 ** level;
    if (size - start >= w) {
      out.push({ level, index: start / w });
      start += w;
    }
  }
  return out;
}

/**
 * Appends leaf hashes to a tree of `size` whose frontier hashes are given (as `frontier(size)` lists
 * them). Returns every complete subtree the new leaves finish (level ≥ 1) and the new frontier.
 */
export function appendLeaves(
  h: Hasher,
  size: number,
  frontierHashes: Hash[],
  leafHashes: Hash[],
): { nodes: (NodeId & { hash: Hash })[]; frontier: Hash[]; size: number } {
  const ids = frontier(size);
  if (ids.length !== frontierHashes.length) throw new Error('the frontier does not match the tree size');
  const stack = ids.map((id, i) => ({ ...id, hash: frontierHashes[i]! }));
  const nodes: (NodeId & { hash: Hash })[] = [];
  let n = size;
  for (const leaf of leafHashes) {
    stack.push({ level: 0, index: n, hash: leaf });
    n += 1;
    while (stack.length >= 2 && stack[stack.length - 1]!.level === stack[stack.length - 2]!.level) {
      const right = stack.pop()!;
      const left = stack.pop()!;
      const merged = { level: left.level + 1, index: left.index / 2, hash: h.node(left.hash, right.hash) };
      nodes.push(merged);
      stack.push(merged);
    }
  }
  return { nodes, frontier: stack.map((s) => s.hash), size: n };
}

/** The root of a tree from its frontier hashes: fold right to left. */
export function rootFromFrontier(h: Hasher, frontierHashes: Hash[]): Hash {
  if (!frontierHashes.length) return h.empty();
  let r = frontierHashes[frontierHashes.length - 1]!;
  for (let i = frontierHashes.length - 2; i >= 0; i--) r = h.node(frontierHashes[i]!, r);
  return r;
}

const HEX = '0123456789abcdef';
export function toHex(b: Uint8Array): string {
  let s = '';
  for (const v of b) s += HEX[v >> 4]! + HEX[v & 15]!;
  return s;
}
export function fromHex(s: string): Uint8Array {
  if (!/^(?:[0-9a-fA-F]{2})*$/.test(s)) throw new Error('not a hex string');
  const out = new Uint8Array(s.length / 2);
  for (let i = 0; i < out.length; i++) out[i] = parseInt(s.slice(i * 2, i * 2 + 2), 16);
  return out;
}
