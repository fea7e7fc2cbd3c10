import { Secret } from 'otpauth';
import { describe, expect, it } from 'vitest';
import { checkTotp, newTotpSecret, totpCode, totpUri } from '../../server/auth/totp.js';

// RFC 6238 Appendix B: T0 = 0, X = 30 s, 8 digits; each hash has its own seed (20, 32 and 64 ASCII bytes)
const SEEDS = {
  SHA1: '12345678901234567890',
  SHA256: '12345678901234567890123456789012',
  SHA512: '1234567890123456789012345678901234567890123456789012345678901234',
} as const;
const VECTORS: [number, keyof typeof SEEDS, string][] = [
  [59, 'SHA1', '94287082'],
  [59, 'SHA256', '46119246'],
  [59, 'SHA512', '90693936'],
  [1111111109, 'SHA1', '07081804'],
  [1111111109, 'SHA256', '68084774'],
  [1111111109, 'SHA512', '25091201'],
  [1111111111, 'SHA1', '14050471'],
  [1111111111, 'SHA256', '67062674'],
  [1111111111, 'SHA512', '99943326'],
  [1234567890, 'SHA1', '89005924'],
  [1234567890, 'SHA256', '91819424'],
  [1234567890, 'SHA512', '93441116'],
  [2000000000, 'SHA1', '69279037'],
  [2000000000, 'SHA256', '90698825'],
  [2000000000, 'SHA512', '38618901'],
  [20000000000, 'SHA1', '65353130'],
  [20000000000, 'SHA256', '77737706'],
  [20000000000, 'SHA512', '47863826'],
];

describe('the time-based one-time password generator', () => {
  for (const [time, algorithm, expected] of VECTORS) {
    it(`when the time is ${time} s with ${algorithm}, then the code is ${expected} (RFC 6238 Appendix B)`, () => {
      const secret = Secret.fromUTF8(SEEDS[algorithm]).base32;
      expect(totpCode(secret, time * 1000, { digits: 8, algorithm })).toBe(expected);
    });
  }

  it('when a phone shows the code for now, or the step just before or after, then it is accepted once', () => {
    // RFC 6238 §5.2 recommends at most one step of clock drift either way
    const secret = Secret.fromUTF8(SEEDS.SHA1).base32;
    const now = 1111111111_000;
    for (const drift of [-30_000, 0, 30_000]) {
      const code = totpCode(secret, now + drift);
      const step = checkTotp(secret, code, { now, lastStep: null });
      expect(step, `drift ${drift}`).toBe(Math.floor((now + drift) / 30_000));
      // §5.2: the verifier must not accept the second attempt of the same OTP
      expect(checkTotp(secret, code, { now, lastStep: step })).toBeNull();
    }
    expect(checkTotp(secret, totpCode(secret, now + 90_000), { now, lastStep: null })).toBeNull();
    expect(checkTotp(secret, '12345', { now, lastStep: null })).toBeNull();
  });

  it('when a secret is made, then it is 160 random bits (RFC 4226 §4 R6) and the URI names the issuer and account', () => {
    const a = newTotpSecret();
    const b = newTotpSecret();
    expect(a).not.toBe(b);
    expect(Secret.fromBase32(a).bytes.length).toBe(20);
    const uri = totpUri(a, 'ada@larkspur.example');
    expect(uri).toMatch(/^otpauth:\/\/totp\/Coretrail:ada%40larkspur\.example\?/);
    expect(uri).toContain(`secret=${a}`);
    expect(uri).toContain('issuer=Coretrail');
  });
});
