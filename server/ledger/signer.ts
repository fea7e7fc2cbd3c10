import { createHash, createPrivateKey, createPublicKey, sign, type KeyObject } from 'node:crypto';
import { headMessage, keyIdOf, toBase64, type PublishedKey, type SignedHead } from '../../shared/ledger/head.js';
import { toHex } from '../../shared/ledger/merkle.js';
import { makeHasher } from '../../shared/ledger/merkle.js';

/** RFC 6962 hashing on node:crypto: the same bytes as @noble/hashes, several times faster here. */
export const nodeHasher = makeHasher((b) => createHash('sha256').update(b).digest());

/** The plant's log key: signs heads with node:crypto's Ed25519 (RFC 8032). */
export type Signer = PublishedKey & {
  raw: Uint8Array;
  signHead(treeSize: number, timestamp: number, rootHash: Uint8Array): SignedHead;
};

/** Raw 32-byte public key of an Ed25519 key object (the last 32 bytes of its SPKI DER). */
export function rawPublicKey(key: KeyObject): Uint8Array {
  const der = createPublicKey(key).export({ format: 'der', type: 'spki' });
  return new Uint8Array(der.subarray(der.length - 32));
}

/** A signer from a PKCS #8 PEM Ed25519 private key (the AUDIT_SIGNING_KEY setting). */
export function signerFromPem(pem: string): Signer {
  const key = createPrivateKey(pem.includes('\\n') ? pem.replace(/\\n/g, '\n') : pem);
  if (key.asymmetricKeyType !== 'ed25519') throw new Error('AUDIT_SIGNING_KEY must be an Ed25519 private key (PEM)');
  const raw = rawPublicKey(key);
  return {
    raw,
    keyId: keyIdOf(raw),
    publicKey: toBase64(raw),
    signHead(treeSize, timestamp, rootHash) {
      const signature = sign(null, headMessage(treeSize, timestamp, rootHash), key);
      return { treeSize, rootHash: toHex(rootHash), timestamp, keyId: keyIdOf(raw), signature: toBase64(signature) };
    },
  };
}

const cache = new Map<string, Signer>();
/** One signer per key text, so the routes and the worker do not parse the PEM per request. */
export function signerFor(pem: string | undefined): Signer | null {
  if (!pem) return null;
  let s = cache.get(pem);
  if (!s) cache.set(pem, (s = signerFromPem(pem)));
  return s;
}
