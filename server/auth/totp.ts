import { createCipheriv, createDecipheriv, createHash, hkdfSync, randomBytes, randomInt } from 'node:crypto';
import { Secret, TOTP } from 'otpauth';

/**
 * Time-based one-time passwords (RFC 6238) through `otpauth`, with the settings every authenticator
 * app reads: SHA-1, six digits, a 30-second step. A code is accepted one step either side of now
 * (RFC 6238 §5.2 allows for a phone's clock drifting) and only once: the caller keeps the last step.
 */
export const ISSUER = 'Coretrail';
const PERIOD = 30;

type Options = { digits?: number; algorithm?: 'SHA1' | 'SHA256' | 'SHA512' };

const totp = (secret: string, label = '', o: Options = {}) =>
  new TOTP({
    issuer: ISSUER,
    label,
    secret: Secret.fromBase32(secret),
    digits: o.digits ?? 6,
    algorithm: o.algorithm ?? 'SHA1',
    period: PERIOD,
  });

/** 160 random bits, the length RFC 4226 §4 recommends, in base32 as apps take it. */
export const newTotpSecret = () => new Secret({ size: 20 }).base32;

export const totpCode = (secret: string, timestampMs = Date.now(), o: Options = {}) =>
  totp(secret, '', o).generate({ timestamp: timestampMs });

/** The otpauth:// address the enrolment QR code carries. */
export const totpUri = (secret: string, account: string) => totp(secret, account).toString();

/** The time step a code belongs to when it is right and newer than `lastStep`; otherwise null. */
export function checkTotp(
  secret: string,
  code: string,
  { now = Date.now(), lastStep }: { now?: number; lastStep: number | null },
): number | null {
  const digits = code.replace(/[\s-]/g, '');
  if (!/^\d{6}$/.test(digits)) return null;
  const delta = totp(secret).validate({ token: digits, timestamp: now, window: 1 });
  if (delta === null) return null;
  const step = Math.floor(now / 1000 / PERIOD) + delta;
  return lastStep !== null && step <= lastStep ? null : step;
}

/**
 * Secrets are kept encrypted (AES-256-GCM, a key derived from JWT_SECRET with HKDF), so a copy of
 * the database alone does not give away anyone's second factor.
 */
const keyFrom = (serverSecret: string) => Buffer.from(hkdfSync('sha256', serverSecret, 'coretrail', 'totp-secret', 32));

export function sealSecret(secret: string, serverSecret: string): string {
  const iv = randomBytes(12);
  const cipher = createCipheriv('aes-256-gcm', keyFrom(serverSecret), iv);
  const body = Buffer.concat([cipher.update(secret, 'utf8'), cipher.final()]);
  return ['v1', iv, cipher.getAuthTag(), body]
    .map((p) => (typeof p === 'string' ? p : p.toString('base64url')))
    .join('.');
}

export function openSecret(sealed: string, serverSecret: string): string {
  const [, iv, tag, body] = sealed.split('.');
  const decipher = createDecipheriv('aes-256-gcm', keyFrom(serverSecret), Buffer.from(iv!, 'base64url'));
  decipher.setAuthTag(Buffer.from(tag!, 'base64url'));
  return Buffer.concat([decipher.update(Buffer.from(body!, 'base64url')), decipher.final()]).toString('utf8');
}

// the serial alphabet: no 0, 1, I or O to misread from paper
const ALPHABET = '23456789ABCDEFGHJKLMNPQRSTUVWXYZ';

/** Ten recovery codes of 50 random bits each, printed as XXXXX-XXXXX. */
export function newRecoveryCodes(): string[] {
  return Array.from({ length: 10 }, () => {
    const chars = Array.from({ length: 10 }, () => ALPHABET[randomInt(ALPHABET.length)]).join('');
    return `${chars.slice(0, 5)}-${chars.slice(5)}`;
  });
}

export const looksLikeRecoveryCode = (code: string) => /^[0-9A-Z]{10}$/.test(normalRecovery(code));
const normalRecovery = (code: string) => code.toUpperCase().replace(/[\s-]/g, '');

/** Codes carry 50 random bits, so a fast hash is enough (a slow one guards guessable passwords). */
export const hashRecoveryCode = (code: string) => createHash('sha256').update(normalRecovery(code)).digest('hex');
