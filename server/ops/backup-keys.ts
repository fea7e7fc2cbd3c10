import fs from 'node:fs';
import { generateX25519Identity, identityToRecipient } from 'age-encryption';

/**
 * The plant's backup key, in age's own file formats, so the `age` command-line tool (Debian's
 * `age` package) reads the same files: an identity file (`AGE-SECRET-KEY-1…`, what `age-keygen`
 * writes) that the plant keeps away from the server, and a recipients file (`age1…`, one a line)
 * that the server encrypts to. X25519 keys: every age release reads them.
 */

const lines = (file: string) =>
  fs
    .readFileSync(file, 'utf8')
    .split(/\r?\n/)
    .map((l) => l.trim())
    .filter((l) => l && !l.startsWith('#'));

/** The public keys to encrypt backups to (BACKUP_AGE_RECIPIENTS). */
export function readRecipients(file: string): string[] {
  const found = lines(file);
  const bad = found.filter((l) => !l.startsWith('age1'));
  if (bad.length || !found.length) {
    throw new Error(
      `${file} should hold age public keys, one a line (age1…); found ${found.length ? `"${bad[0]}"` : 'none'}`,
    );
  }
  return found;
}

/** The secret keys to decrypt backups with (BACKUP_AGE_IDENTITY). */
export function readIdentities(file: string): string[] {
  const found = lines(file).filter((l) => l.startsWith('AGE-SECRET-KEY-'));
  if (!found.length) throw new Error(`${file} holds no age secret key (AGE-SECRET-KEY-1…)`);
  return found;
}

/**
 * Makes a new key: the identity file at `file` (0600, never overwritten) laid out as age-keygen
 * lays it out, and its public key returned for the recipients file.
 */
export async function makeBackupKey(file: string): Promise<string> {
  const identity = await generateX25519Identity();
  const recipient = await identityToRecipient(identity);
  const text = `# created: ${new Date().toISOString()}\n# public key: ${recipient}\n${identity}\n`;
  fs.writeFileSync(file, text, { flag: 'wx', mode: 0o600 });
  return recipient;
}
