import { createHash, randomBytes } from 'node:crypto';
import { MerkleTree } from 'merkletreejs';
import { describe, expect, it } from 'vitest';
import {
  appendLeaves,
  consistencyProof,
  frontier,
  fromHex,
  inclusionProof,
  leafSource,
  rfc6962,
  rootFromFrontier,
  rootHash,
  toHex,
  treeHashOfLeaves,
  verifyConsistency,
  verifyInclusion,
  makeHasher,
  nodesNeeded,
  type Hash,
} from '../../shared/ledger/merkle.js';

// Test vectors published with transparency-dev/merkle (Go), the successor of the RFC 6962 code in
// certificate-transparency-go: rfc6962/rfc6962_test.go (hasher) and proof/verify_test.go (the
// 8-leaf tree's leaves, roots, inclusion and consistency proofs; from the CT C++ reference tests).
const dh = (s: string) => fromHex(s);
const VECTOR_LEAVES = [
  '',
  '00',
  '10',
  '2021',
  '3031',
  '40414243',
  '5051525354555657',
  '606162636465666768696a6b6c6d6e6f',
].map(dh);
const VECTOR_ROOTS = [
  '6e340b9cffb37a989ca544e6bb780a2c78901d3fb33738768511a30617afa01d',
  'fac54203e7cc696cf0dfcb42c92a1d9dbaf70ad9e621f4bd8d98662f00e3c125',
  'aeb6bcfe274b70a14fb067a5e5578264db0fa9b51af5e0ba159158f329e06e77',
  'd37ee418976dd95753c1c73862b9398fa2a2cf9b4ff0fdfe8b30cd95209614b7',
  '4e3bbb1f7b478dcfe71fb631631519a3bca12c9aefca1612bfce4c13a86264d4',
  '76e67dadbcdf1e10e1b74ddc608abd2f98dfb16fbce75277b5232a127f2087ef',
  'ddb89be403809e325750d3d263cd78929c2942b7942a34b77e122c9594a74c8c',
  '5dc9da79a70659a9ad559cb701ded9a2ab9d823aad2f4960cfe370eff4604328',
];
// { leaf (1-based, as in the Go table), size, proof }
const VECTOR_INCLUSION: [number, number, string[]][] = [
  [1, 1, []],
  [
    1,
    8,
    [
      '96a296d224f285c67bee93c30f8a309157f0daa35dc5b87e410b78630a09cfc7',
      '5f083f0a1a33ca076a95279832580db3e0ef4584bdff1f54c8a360f50de3031e',
      '6b47aaf29ee3c2af9af889bc1fb9254dabd31177f16232dd6aab035ca39bf6e4',
    ],
  ],
  [
    6,
    8,
    [
      'bc1a0643b12e4d2d7c77918f44e0f4f79a838b6cf9ec5b5c283e1f4d88599e6b',
      'ca854ea128ed050b41b35ffc1b87b8eb2bde461e9e3b5596ece6b9d5975a0ae0',
      'd37ee418976dd95753c1c73862b9398fa2a2cf9b4ff0fdfe8b30cd95209614b7',
    ],
  ],
  [3, 3, ['fac54203e7cc696cf0dfcb42c92a1d9dbaf70ad9e621f4bd8d98662f00e3c125']],
  [
    2,
    5,
    [
      '6e340b9cffb37a989ca544e6bb780a2c78901d3fb33738768511a30617afa01d',
      '5f083f0a1a33ca076a95279832580db3e0ef4584bdff1f54c8a360f50de3031e',
      'bc1a0643b12e4d2d7c77918f44e0f4f79a838b6cf9ec5b5c283e1f4d88599e6b',
    ],
  ],
];
const VECTOR_CONSISTENCY: [number, number, string[]][] = [
  [1, 1, []],
  [
    1,
    8,
    [
      '96a296d224f285c67bee93c30f8a309157f0daa35dc5b87e410b78630a09cfc7',
      '5f083f0a1a33ca076a95279832580db3e0ef4584bdff1f54c8a360f50de3031e',
      '6b47aaf29ee3c2af9af889bc1fb9254dabd31177f16232dd6aab035ca39bf6e4',
    ],
  ],
  [
    6,
    8,
    [
      '0ebc5d3437fbe2db158b9f126a1d118e308181031d0a949f8dededebc558ef6a',
      'ca854ea128ed050b41b35ffc1b87b8eb2bde461e9e3b5596ece6b9d5975a0ae0',
      'd37ee418976dd95753c1c73862b9398fa2a2cf9b4ff0fdfe8b30cd95209614b7',
    ],
  ],
  [
    2,
    5,
    [
      '5f083f0a1a33ca076a95279832580db3e0ef4584bdff1f54c8a360f50de3031e',
      'bc1a0643b12e4d2d7c77918f44e0f4f79a838b6cf9ec5b5c283e1f4d88599e6b',
    ],
  ],
  [
    6,
    7,
    [
      '0ebc5d3437fbe2db158b9f126a1d118e308181031d0a949f8dededebc558ef6a',
      'b08693ec2e721597130641e8211e7eedccb4c26413963eee6c1e2ed16ffb1a5f',
      'd37ee418976dd95753c1c73862b9398fa2a2cf9b4ff0fdfe8b30cd95209614b7',
    ],
  ],
];
const SOME_HASH = dh('abacaba000000000000000000000000000000000000000000060061e00123456'); // verify_test.go
const EMPTY_ROOT = dh('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855'); // SHA-256("")

const leafHashes = VECTOR_LEAVES.map((l) => rfc6962.leaf(l));
const src = leafSource(rfc6962, leafHashes);
const flip = (b: Hash, bit: number) => {
  const c = b.slice();
  c[0] = c[0]! ^ (1 << bit);
  return c;
};

describe('RFC 6962 hashing (transparency-dev/merkle rfc6962_test.go)', () => {
  it('when hashing the empty tree, an empty leaf, a leaf and a node, then the published digests come out', () => {
    expect(toHex(rfc6962.empty())).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
    expect(toHex(rfc6962.leaf(new Uint8Array()))).toBe(
      '6e340b9cffb37a989ca544e6bb780a2c78901d3fb33738768511a30617afa01d',
    );
    expect(toHex(rfc6962.leaf(new TextEncoder().encode('L123456')))).toBe(
      '395aa064aa4c29f7010acfe3f25db9485bbd4b91897b6ad7ad547639252b4d56',
    );
    const enc = (s: string) => new TextEncoder().encode(s);
    expect(toHex(rfc6962.node(enc('N123'), enc('N456')))).toBe(
      'aa217fe888e47007fa15edab33c2b492a722cb106c64667fc2b044444de66bbb',
    );
  });

  it('when node:crypto is injected instead of @noble/hashes, then every hash is the same', () => {
    const nodeHasher = makeHasher((b) => createHash('sha256').update(b).digest());
    for (const l of VECTOR_LEAVES) expect(toHex(nodeHasher.leaf(l))).toBe(toHex(rfc6962.leaf(l)));
    expect(toHex(nodeHasher.node(leafHashes[0]!, leafHashes[1]!))).toBe(
      toHex(rfc6962.node(leafHashes[0]!, leafHashes[1]!)),
    );
  });
});

describe('tree hash and proofs (transparency-dev/merkle proof/verify_test.go)', () => {
  it('when the tree holds the first n of the 8 vector leaves, then its root is the published root for n', () => {
    for (let n = 1; n <= 8; n++) {
      expect(toHex(treeHashOfLeaves(rfc6962, leafHashes.slice(0, n)))).toBe(VECTOR_ROOTS[n - 1]);
    }
    expect(toHex(rootHash(rfc6962, src, 0))).toBe(toHex(EMPTY_ROOT));
  });

  it('when building inclusion proofs for the published cases, then they equal the published paths and verify', () => {
    for (const [leaf, size, path] of VECTOR_INCLUSION) {
      const proof = inclusionProof(rfc6962, src, leaf - 1, size);
      expect(proof.map(toHex)).toEqual(path);
      expect(verifyInclusion(rfc6962, leaf - 1, size, leafHashes[leaf - 1]!, proof, dh(VECTOR_ROOTS[size - 1]!))).toBe(
        true,
      );
    }
  });

  it('when an inclusion proof is corrupted as verify_test.go corrupts it, then no variant verifies', () => {
    for (const [leaf, size, path] of VECTOR_INCLUSION.slice(1)) {
      const m = leaf - 1;
      const proof = path.map(dh);
      const root = dh(VECTOR_ROOTS[size - 1]!);
      const lh = leafHashes[m]!;
      const probes: [number, number, Hash, Hash[], Hash][] = [
        [m - 1, size, lh, proof, root],
        [m + 1, size, lh, proof, root],
        [m ^ 2, size, lh, proof, root],
        [m, size * 2, lh, proof, root],
        [m, Math.floor(size / 2), lh, proof, root],
        [m, size, new TextEncoder().encode('WrongLeaf'), proof, root],
        [m, size, lh, proof, EMPTY_ROOT],
        [m, size, lh, proof, SOME_HASH],
        [m, size, lh, [...proof, new Uint8Array()], root],
        [m, size, lh, [...proof, root], root],
        [m, size, lh, [new Uint8Array(), ...proof], root],
        [m, size, lh, [root, ...proof], root],
        ...proof.map((_, i): [number, number, Hash, Hash[], Hash] => [
          m,
          size,
          lh,
          proof.map((p, j) => (j === i ? flip(p, 3) : p)),
          root,
        ]),
        ...(proof.length > 0 ? [[m, size, lh, proof.slice(0, -1), root] as [number, number, Hash, Hash[], Hash]] : []),
        ...(proof.length > 1
          ? [[m, size, lh, [proof[0]!, SOME_HASH, ...proof.slice(1)], root] as [number, number, Hash, Hash[], Hash]]
          : []),
      ];
      for (const [i, n, l, p, r] of probes) expect(verifyInclusion(rfc6962, i, n, l, p, r)).toBe(false);
    }
  });

  it('when building consistency proofs for the published cases, then they equal the published proofs and verify', () => {
    for (const [m, n, path] of VECTOR_CONSISTENCY) {
      const proof = consistencyProof(rfc6962, src, m, n);
      expect(proof.map(toHex)).toEqual(path);
      expect(verifyConsistency(rfc6962, m, n, proof, dh(VECTOR_ROOTS[m - 1]!), dh(VECTOR_ROOTS[n - 1]!))).toBe(true);
    }
  });

  it('when a consistency proof is corrupted as verify_test.go corrupts it, then no variant verifies', () => {
    for (const [m, n, path] of VECTOR_CONSISTENCY.filter(([, , p]) => p.length > 0)) {
      const proof = path.map(dh);
      const r1 = dh(VECTOR_ROOTS[m - 1]!);
      const r2 = dh(VECTOR_ROOTS[n - 1]!);
      const wrong = new TextEncoder().encode('WrongRoot');
      const probes: [number, number, Hash, Hash, Hash[]][] = [
        [m - 1, n, r1, r2, proof],
        [m + 1, n, r1, r2, proof],
        [m ^ 2, n, r1, r2, proof],
        [m, n * 2, r1, r2, proof],
        [m, Math.floor(n / 2), r1, r2, proof],
        [m, n, wrong, r2, proof],
        [m, n, r1, wrong, proof],
        [m, n, r2, r1, proof],
        [m, n, r1, r2, []],
        [m, n, r1, r2, [...proof, new Uint8Array()]],
        [m, n, r1, r2, [...proof, r1]],
        [m, n, r1, r2, [...proof, r2]],
        [m, n, r1, r2, [new Uint8Array(), ...proof]],
        [m, n, r1, r2, [r1, ...proof]],
        [m, n, r1, r2, [r2, ...proof]],
        [m, n, r1, r2, [proof[0]!, ...proof]],
        [m, n, r1, r2, proof.slice(0, -1)],
        ...proof.map((_, i): [number, number, Hash, Hash, Hash[]] => [
          m,
          n,
          r1,
          r2,
          proof.map((p, j) => (j === i ? flip(p, 4) : p)),
        ]),
      ];
      for (const [a, b, x, y, p] of probes) expect(verifyConsistency(rfc6962, a, b, p, x, y)).toBe(false);
    }
  });

  it('when sizes are equal, empty or backwards, then the edge cases of verify_test.go hold', () => {
    const r1 = new TextEncoder().encode("don't care 1");
    const r2 = new TextEncoder().encode("don't care 2");
    const cases: [number, number, Hash, Hash, Hash[], boolean][] = [
      [0, 0, r1, r2, [], false],
      [1, 1, r1, r2, [], false],
      [0, 0, r1, r1, [], true],
      [0, 1, r1, r2, [], true],
      [1, 1, r2, r2, [], true],
      [1, 0, r1, r2, [], false],
      [2, 1, r1, r2, [], false],
      [1, 2, r1, r2, [], false],
      [0, 0, EMPTY_ROOT, r2, [], false],
      [1, 1, EMPTY_ROOT, r2, [], false],
      [0, 0, EMPTY_ROOT, EMPTY_ROOT, [EMPTY_ROOT], false],
      [0, 1, EMPTY_ROOT, EMPTY_ROOT, [EMPTY_ROOT], false],
      [1, 1, EMPTY_ROOT, EMPTY_ROOT, [EMPTY_ROOT], false],
    ];
    for (const [a, b, x, y, p, want] of cases) expect(verifyConsistency(rfc6962, a, b, p, x, y)).toBe(want);
    for (const [i, n] of [
      [0, 0],
      [1, 0],
      [2, 1],
    ]) {
      expect(verifyInclusion(rfc6962, i!, n!, SOME_HASH, [], EMPTY_ROOT)).toBe(false);
    }
  });
});

describe('against merkletreejs (a general-purpose Merkle library, set up RFC 6962 style)', () => {
  // pre-hashed leaves (0x00 prefix done by us), 0x01 before each pair, an odd node carried up
  // unchanged: the tree merkletreejs then builds is the RFC's (the left subtree is the largest power of 2)
  const sha = (b: Buffer) => createHash('sha256').update(b).digest();
  const reference = (leaves: Hash[]) =>
    new MerkleTree(
      leaves.map((l) => Buffer.from(l)),
      sha,
      { concatenator: (bufs: Buffer[]) => Buffer.concat([Buffer.from([1]), ...bufs]) },
    );

  it('when random logs of 1 to 300 entries are built, then roots and every inclusion path agree', () => {
    for (let trial = 0; trial < 60; trial++) {
      const n = trial < 20 ? trial + 1 : 1 + Math.floor(Math.random() * 300);
      const leaves = Array.from({ length: n }, () => rfc6962.leaf(randomBytes(1 + Math.floor(Math.random() * 40))));
      const ref = reference(leaves);
      const get = leafSource(rfc6962, leaves);
      const root = rootHash(rfc6962, get, n);
      expect(toHex(root)).toBe(ref.getRoot().toString('hex'));
      for (let i = 0; i < n; i += Math.max(1, Math.floor(n / 17))) {
        const ours = inclusionProof(rfc6962, get, i, n);
        const theirs = ref.getProof(Buffer.from(leaves[i]!), i).map((p) => p.data.toString('hex'));
        expect(ours.map(toHex)).toEqual(theirs);
        expect(verifyInclusion(rfc6962, i, n, leaves[i]!, ours, root)).toBe(true);
      }
    }
  });

  it('when a random log grows, then consistency proofs between any two of its sizes verify against the reference roots', () => {
    const leaves = Array.from({ length: 257 }, (_, i) => rfc6962.leaf(new TextEncoder().encode(`entry ${i}`)));
    const get = leafSource(rfc6962, leaves);
    for (let trial = 0; trial < 200; trial++) {
      const b = 1 + Math.floor(Math.random() * 257);
      const a = 1 + Math.floor(Math.random() * b);
      const r1 = reference(leaves.slice(0, a)).getRoot();
      const r2 = reference(leaves.slice(0, b)).getRoot();
      const proof = consistencyProof(rfc6962, get, a, b);
      expect(verifyConsistency(rfc6962, a, b, proof, r1, r2)).toBe(true);
      if (a < b) expect(verifyConsistency(rfc6962, a, b, proof, r2, r1)).toBe(false); // swapped roots
    }
  });
});

describe('appending with a frontier (what the sequencer stores)', () => {
  it('when leaves are appended in uneven batches, then the frontier root equals the tree hash and the new nodes are its complete subtrees', () => {
    const leaves = Array.from({ length: 100 }, (_, i) => rfc6962.leaf(new Uint8Array([i])));
    const get = leafSource(rfc6962, leaves);
    let size = 0;
    let front: Hash[] = [];
    const stored = new Map<string, string>();
    for (const step of [1, 2, 3, 5, 8, 13, 21, 47]) {
      const batch = leaves.slice(size, size + step);
      const r = appendLeaves(rfc6962, size, front, batch);
      for (const nd of r.nodes) stored.set(`${nd.level}:${nd.index}`, toHex(nd.hash));
      size = r.size;
      front = r.frontier;
      expect(front.length).toBe(frontier(size).length);
      expect(toHex(rootFromFrontier(rfc6962, front))).toBe(toHex(rootHash(rfc6962, get, size)));
    }
    // a tree of n leaves has n − popcount(n) interior complete subtrees
    expect(stored.size).toBe(100 - 3);
    for (const [key, hex] of stored) {
      const [level, index] = key.split(':').map(Number);
      expect(hex).toBe(toHex(get(level!, index!)));
    }
  });

  it('when a proof is planned, then it asks only for complete subtrees that exist in the tree', () => {
    const need = nodesNeeded((g) => inclusionProof(rfc6962, g, 37, 100));
    for (const { level, index } of need) expect((index + 1) * 2 ** level).toBeLessThanOrEqual(100);
    expect(need.length).toBeLessThanOrEqual(2 * Math.ceil(Math.log2(100)));
  });
});
