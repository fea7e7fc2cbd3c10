import { createPrivateKey } from 'node:crypto';

// RFC 8410 §7: the PKCS #8 DER of an Ed25519 private key is this prefix and the 32-byte seed
const PKCS8_PREFIX = Buffer.from('302e020100300506032b657004220420', 'hex');

/** An Ed25519 key (PKCS #8 PEM) from a 32-byte seed given in hex. */
export const keyFromSeed = (seedHex: string) =>
  createPrivateKey({ key: Buffer.concat([PKCS8_PREFIX, Buffer.from(seedHex, 'hex')]), format: 'der', type: 'pkcs8' })
    .export({ format: 'pem', type: 'pkcs8' })
    .toString();

// The tests' plant signs with the secret key of RFC 8032 §7.1 TEST 1, and "another plant" with that of
// TEST 2: fixed, so every test file that signs heads in the shared test database signs with one key.
export const TEST_PLANT_KEY = keyFromSeed('9d61b19deffd5a60ba844af492ec2cc44449c5697b326919703bac031cae7f60');
export const OTHER_PLANT_KEY = keyFromSeed('4ccd089b28ff96da9db6c346ec114e0f5b8a319f35aba624da8cf6ed4fb8a6fb');

export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
