import { createHash, createPrivateKey, createPublicKey, sign } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { decodeInclusionCode, encodeInclusionCode, pathLength } from '../../shared/ledger/code.js';
import { DOCUMENT_FORMAT, verifyCode, verifyDocument } from '../../shared/ledger/document.js';
import { contentHash, entryLeafHash, type LogEntry } from '../../shared/ledger/entry.js';
import {
  checkHead,
  ed25519Verify,
  fromBase64,
  headMessage,
  keyIdOf,
  toBase64,
  type SignedHead,
} from '../../shared/ledger/head.js';
import {
  consistencyProof,
  fromHex,
  inclusionProof,
  leafSource,
  rfc6962,
  rootHash,
  toHex,
} from '../../shared/ledger/merkle.js';

// RFC 8032 §7.1, "Test Vectors for Ed25519", TEST 1 to TEST 3 (secret key, public key, message, signature)
const RFC8032 = [
  {
    name: 'TEST 1',
    secret: '9d61b19deffd5a60ba844af492ec2cc44449c5697b326919703bac031cae7f60',
    public: 'd75a980182b10ab7d54bfed3c964073a0ee172f3daa62325af021a68f707511a',
    message: '',
    signature:
      'e5564300c360ac729086e2cc806e828a84877f1eb8e5d974d873e065224901555fb8821590a33bacc61e39701cf9b46bd25bf5f0595bbe24655141438e7a100b',
  },
  {
    name: 'TEST 2',
    secret: '4ccd089b28ff96da9db6c346ec114e0f5b8a319f35aba624da8cf6ed4fb8a6fb',
    public: '3d4017c3e843895a92b70aa74d1b7ebc9c982ccf2ec4968cc0cd55f12af4660c',
    message: '72',
    signature:
      '92a009a9f0d4cab8720e820b5f642540a2b27b5416503f8fb3762223ebdb69da085ac1e43e15996e458f3613d0f11d8c387b2eaeb4302aeeb00d291612bb0c00',
  },
  {
    name: 'TEST 3',
    secret: 'c5aa8df43f9f837bedb7442f31dcb7b166d38535076f094b85ce3a2e0b4458f7',
    public: 'fc51cd8e6218a1a38da47ed00230f0580816ed13ba3303ac5deb911548908025',
    message: 'af82',
    signature:
      '6291d657deec24024827e69c3abe01a30ce548a284743a445e3680d7db5ac3ac18ff9b538d16f290ae67f760984dc6594a7c15e9716ed28dc027beceea1ec40a',
  },
];

// RFC 8410 §7: PKCS #8 DER of an Ed25519 private key = this prefix ‖ the 32-byte secret
const keyOf = (secretHex: string) =>
  createPrivateKey({
    key: Buffer.concat([Buffer.from('302e020100300506032b657004220420', 'hex'), Buffer.from(secretHex, 'hex')]),
    format: 'der',
    type: 'pkcs8',
  });
const rawPub = (secretHex: string) => {
  const der = createPublicKey(keyOf(secretHex)).export({ format: 'der', type: 'spki' });
  return new Uint8Array(der.subarray(der.length - 32));
};

describe('Ed25519 (RFC 8032 §7.1 test vectors)', () => {
  for (const v of RFC8032) {
    it(`when ${v.name} is signed with node:crypto and checked with @noble/ed25519, then both give the published values`, () => {
      expect(toHex(rawPub(v.secret))).toBe(v.public);
      const sig = sign(null, Buffer.from(v.message, 'hex'), keyOf(v.secret));
      expect(sig.toString('hex')).toBe(v.signature);
      expect(ed25519Verify(fromHex(v.signature), fromHex(v.message), fromHex(v.public))).toBe(true);
      const bad = fromHex(v.signature);
      bad[5] = bad[5]! ^ 1;
      expect(ed25519Verify(bad, fromHex(v.message), fromHex(v.public))).toBe(false);
      expect(ed25519Verify(fromHex(v.signature), fromHex(`${v.message}00`), fromHex(v.public))).toBe(false);
    });
  }

  it("when a key id is taken, then it is SHA-256 of the key's DER SubjectPublicKeyInfo (RFC 6962 §3.2), as node:crypto exports it", () => {
    const spki = createPublicKey(keyOf(RFC8032[0]!.secret)).export({ format: 'der', type: 'spki' });
    expect(keyIdOf(fromHex(RFC8032[0]!.public))).toBe(createHash('sha256').update(spki).digest('hex'));
  });

  it('when a head is laid out for signing, then it is the 50 bytes of an RFC 6962 §3.5 TreeHeadSignature', () => {
    const root = new Uint8Array(32).fill(0xab);
    const m = headMessage(258, 0x0102030405, root);
    expect(m.length).toBe(50);
    expect(toHex(m.subarray(0, 18))).toBe('0001' + '0000000102030405' + '0000000000000102');
    expect(toHex(m.subarray(18))).toBe(toHex(root));
  });
});

describe('the compact code', () => {
  it('when codes are made for random places in random trees, then they read back exactly and hold only QR alphanumeric characters', () => {
    for (let i = 0; i < 200; i++) {
      const size = 1 + Math.floor(Math.random() * 5_000_000);
      const leafIndex = Math.floor(Math.random() * size);
      const k = pathLength(leafIndex, size);
      const c = {
        leafIndex,
        treeSize: size,
        leafHash: crypto.getRandomValues(new Uint8Array(32)),
        proof: Array.from({ length: k }, () => crypto.getRandomValues(new Uint8Array(32))),
      };
      const text = encodeInclusionCode(c);
      expect(text).toMatch(/^[0-9A-Z $%*+\-./:]+$/); // ISO/IEC 18004 alphanumeric mode
      const back = decodeInclusionCode(` ${text.toLowerCase().replace(/(.{40})/g, '$1\n')} `);
      expect(back.leafIndex).toBe(leafIndex);
      expect(back.treeSize).toBe(size);
      expect(toHex(back.leafHash)).toBe(toHex(c.leafHash));
      expect(back.proof.map(toHex)).toEqual(c.proof.map(toHex));
    }
  });

  it('when one character of a code is changed, then it reads as mistyped, not as another code', () => {
    const text = encodeInclusionCode({
      leafIndex: 5,
      treeSize: 9,
      leafHash: new Uint8Array(32),
      proof: [1, 2, 3, 4].map(() => new Uint8Array(32).fill(7)).slice(0, pathLength(5, 9)),
    });
    for (let i = 4; i < text.length; i += 7) {
      const ch = text[i] === 'A' ? 'B' : 'A';
      expect(() => decodeInclusionCode(text.slice(0, i) + ch + text.slice(i + 1))).toThrow(/mistyped|length|outside/);
    }
    expect(() => decodeInclusionCode('XX1:ABC')).toThrow(/starts with CT1:/);
  });
});

// a small log held in memory, signed by the plant of RFC 8032 TEST 1 (and a stranger's TEST 2)
function smallLog() {
  const plant = { keyId: keyIdOf(rawPub(RFC8032[0]!.secret)), publicKey: toBase64(rawPub(RFC8032[0]!.secret)) };
  const signHead = (secret: string, treeSize: number, root: Uint8Array): SignedHead => ({
    treeSize,
    rootHash: toHex(root),
    timestamp: Date.UTC(2026, 11, 3, 9, 0),
    keyId: keyIdOf(rawPub(secret)),
    signature: toBase64(sign(null, headMessage(treeSize, Date.UTC(2026, 11, 3, 9, 0), root), keyOf(secret))),
  });
  const content = { unit: 'LB-100', readings: [{ name: 'bore', position: '1T', value: 4.0302, unit: 'in' }] };
  const entries: LogEntry[] = Array.from({ length: 11 }, (_, i) => ({
    id: i + 1,
    occurredAt: new Date(Date.UTC(2026, 11, 3, 8, i)).toISOString(),
    actorId: 3,
    actorRole: 'quality',
    action: i === 6 ? 'document.issued' : 'test.event',
    entity: 'unit',
    entityId: 'LB-100',
    before: null,
    after: i === 6 ? { kind: 'build_record', title: null, contentHash: contentHash(content) } : { n: i },
    requestId: null,
  }));
  const leaves = entries.map((e) => entryLeafHash(e));
  const get = leafSource(rfc6962, leaves);
  const docAt = (size: number, secret = RFC8032[0]!.secret) => {
    const root = rootHash(rfc6962, get, size);
    const proof = inclusionProof(rfc6962, get, 6, size);
    return {
      format: DOCUMENT_FORMAT,
      content,
      entry: entries[6]!,
      leafIndex: 6,
      treeSize: size,
      rootHash: toHex(root),
      proof: proof.map(toHex),
      head: signHead(secret, size, root),
      code: encodeInclusionCode({ leafIndex: 6, treeSize: size, leafHash: leaves[6]!, proof }),
    };
  };
  return { plant, docAt, get, signHead };
}

describe('checking a document offline', () => {
  const { plant, docAt, get, signHead } = smallLog();
  const copy = <T>(x: T): T => JSON.parse(JSON.stringify(x)) as T;

  it('when the document is as issued, then it is intact', () => {
    expect(verifyDocument(docAt(9), [plant])).toMatchObject({ verdict: 'intact', leafIndex: 6, treeSize: 9 });
  });

  it('when one reading in a copy of its data is changed, then it is altered', () => {
    const d = copy(docAt(9));
    d.content.readings[0]!.value = 4.0312;
    expect(verifyDocument(d, [plant])).toMatchObject({ verdict: 'altered', reason: expect.stringMatching(/content/) });
  });

  it('when the entry is rewritten to match changed content, then the code shows the log holds another record there', () => {
    const d = copy(docAt(9));
    d.content.readings[0]!.value = 4.0312;
    (d.entry.after as { contentHash: string }).contentHash = contentHash(d.content);
    expect(verifyDocument(d, [plant]).verdict).toBe('altered');
    delete (d as { code?: string }).code;
    expect(verifyDocument(d, [plant]).verdict).toBe('not_in_log');
  });

  it("when the head is signed with another plant's key, then the document is unknown", () => {
    expect(verifyDocument(docAt(9, RFC8032[1]!.secret), [plant]).verdict).toBe('unknown');
  });

  it('when the signed head is changed, or the file is not a document, then it is altered or unreadable', () => {
    const d = copy(docAt(9));
    d.head.timestamp += 1;
    expect(verifyDocument(d, [plant]).verdict).toBe('altered');
    expect(checkHead(d.head, [plant])).toBe('bad_signature');
    expect(verifyDocument({ hello: 'world' }, [plant]).verdict).toBe('unreadable');
  });

  it('when a code alone is checked against a larger published head, then a consistency proof carries it there', () => {
    const d = docAt(9);
    const latest = signHead(RFC8032[0]!.secret, 11, rootHash(rfc6962, get, 11));
    const proof = consistencyProof(rfc6962, get, 9, 11).map(toHex);
    expect(verifyCode(d.code, latest, [plant], proof).verdict).toBe('intact');
    expect(verifyCode(d.code, latest, [plant], proof.slice(1)).verdict).toBe('not_in_log');
    const forged = encodeInclusionCode({ ...decodeInclusionCode(d.code), leafHash: new Uint8Array(32) });
    expect(verifyCode(forged, latest, [plant], proof).verdict).toBe('not_in_log');
    expect(
      verifyCode(d.code, { ...latest, signature: toBase64(fromBase64(latest.signature).reverse()) }, [plant], proof)
        .verdict,
    ).toBe('unknown');
  });
});
