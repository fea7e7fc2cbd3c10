import { spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import type { ReadableStream as WebReadableStream } from 'node:stream/web';
import { Decrypter, Encrypter } from 'age-encryption';
import { QueryTypes, type Sequelize } from 'sequelize';
import pg from 'pg';
import { findPgBin } from '../../db/cluster.mjs';

/**
 * Backups are pg_dump's custom-format archives (compressed, restorable table by table with
 * pg_restore). They hold password hashes and sessions, so each is written 0600 into a folder only
 * its owner can enter (0700), and may be encrypted to the plant's age key (backup-keys.ts). A
 * restore always goes into a fresh database, never over the one in use, so a mistaken restore
 * cannot destroy current records.
 */

/** The first line of every age file (age-encryption.org/v1, the format's specification). */
const AGE_HEADER = 'age-encryption.org/v1\n';

export function pgTool(name: 'pg_dump' | 'pg_restore' | 'pg_basebackup' | 'pg_ctl') {
  const bin = findPgBin();
  return bin ? path.join(bin, name) : name;
}

/**
 * A connection URL without its password, and the environment that carries the password instead:
 * a program's arguments are visible to every user of the machine (`ps`), its environment is not.
 */
export function withoutPassword(url: string): { url: string; env: NodeJS.ProcessEnv } {
  const u = new URL(url);
  const password = decodeURIComponent(u.password);
  u.password = '';
  return { url: u.toString(), env: { ...process.env, PGPASSWORD: password } };
}

/** Creates `dir` for the owner alone (0700), or closes an existing one to everyone else. */
export function privateFolder(dir: string) {
  fs.mkdirSync(dir, { recursive: true, mode: 0o700 });
  const mode = fs.statSync(dir).mode & 0o777;
  if (mode & 0o077) {
    try {
      fs.chmodSync(dir, 0o700);
    } catch (err) {
      throw new Error(
        `${dir} can be entered by other users (mode ${mode.toString(8)}) and could not be closed: ${String(err)}`,
      );
    }
  }
}

/**
 * Writes `source` to `file` as 0600, through a `.partial` name that becomes `file` only once
 * `alsoWaitFor` (the program producing the data) has succeeded too: a failed backup never looks finished.
 */
async function writePrivately(file: string, source: Readable, alsoWaitFor: Promise<void> = Promise.resolve()) {
  const partial = `${file}.partial`;
  const fd = fs.openSync(partial, 'wx', 0o600);
  try {
    await Promise.all([pipeline(source, fs.createWriteStream('', { fd, autoClose: false })), alsoWaitFor]);
    fs.fsyncSync(fd);
  } catch (err) {
    fs.closeSync(fd);
    fs.rmSync(partial, { force: true });
    throw err;
  }
  fs.closeSync(fd);
  fs.renameSync(partial, file);
}

// age-encryption speaks the web's streams (the DOM's types); Node converts them both ways
const toWeb = (r: Readable) => Readable.toWeb(r) as unknown as ReadableStream<Uint8Array>;
const fromWeb = (w: ReadableStream<Uint8Array>) => Readable.fromWeb(w as unknown as WebReadableStream<Uint8Array>);

/** Runs a program whose standard output is the data; resolves once it has exited 0. */
function producer(cmd: string, args: string[], env: NodeJS.ProcessEnv) {
  const child = spawn(cmd, args, { env, stdio: ['ignore', 'pipe', 'pipe'] });
  let stderr = '';
  child.stderr.on('data', (d) => (stderr += d));
  const done = new Promise<void>((resolve, reject) => {
    child.once('error', reject);
    child.once('close', (code) =>
      code === 0 ? resolve() : reject(new Error(`${path.basename(cmd)} failed (${code}): ${stderr.trim()}`)),
    );
  });
  return { stdout: child.stdout, done };
}

export type BackupResult = { file: string; bytes: number; encrypted: boolean };

/**
 * Writes a pg_dump archive of `url` to `file`. With `recipients` (age public keys, `age1…`), the
 * archive is encrypted to them as it is written: the machine that makes backups needs no secret,
 * and only a holder of the matching key file can read them.
 */
export async function backupDatabase(
  url: string,
  file: string,
  { recipients = [] }: { recipients?: string[] } = {},
): Promise<BackupResult> {
  privateFolder(path.dirname(file));
  const { url: bare, env } = withoutPassword(url);
  const dump = producer(pgTool('pg_dump'), ['--format=custom', '--no-owner', '--dbname', bare], env);
  let source: Readable = dump.stdout;
  if (recipients.length) {
    const e = new Encrypter();
    for (const r of recipients) e.addRecipient(r);
    source = fromWeb(await e.encrypt(toWeb(dump.stdout)));
  }
  await writePrivately(file, source, dump.done);
  return { file, bytes: fs.statSync(file).size, encrypted: recipients.length > 0 };
}

/** Whether a file is an age file, by its first line. */
export function isEncrypted(file: string): boolean {
  const fd = fs.openSync(file, 'r');
  try {
    const head = Buffer.alloc(AGE_HEADER.length);
    fs.readSync(fd, head, 0, head.length, 0);
    return head.toString('latin1') === AGE_HEADER;
  } finally {
    fs.closeSync(fd);
  }
}

/**
 * Decrypts an age file with the plant's identities (`AGE-SECRET-KEY-1…`) into a private
 * temporary folder. The whole file is read and authenticated before anything is restored from it.
 */
export async function decryptToTemp(file: string, identities: string[]) {
  if (!identities.length) {
    throw new Error(`${file} is encrypted: give the plant's backup key (BACKUP_AGE_IDENTITY=FILE) to restore it`);
  }
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'coretrail-restore-'));
  const d = new Decrypter();
  for (const i of identities) d.addIdentity(i);
  const plain = path.join(dir, 'backup.dump');
  try {
    await writePrivately(plain, fromWeb(await d.decrypt(toWeb(fs.createReadStream(file)))));
  } catch (err) {
    fs.rmSync(dir, { recursive: true, force: true });
    throw new Error(`${file} could not be decrypted with the key given: ${(err as Error).message}`);
  }
  return { file: plain, cleanup: () => fs.rmSync(dir, { recursive: true, force: true }) };
}

/** Creates `database` (it must not exist) and restores the archive, plain or age-encrypted, into it. */
export async function restoreDatabase(
  adminUrl: string,
  file: string,
  database: string,
  { identities = [] }: { identities?: string[] } = {},
) {
  if (!/^[a-z_][a-z0-9_]{0,62}$/.test(database)) throw new Error(`"${database}" is not a plain database name`);
  if (!fs.existsSync(file)) throw new Error(`no such backup: ${file}`);
  const plain = isEncrypted(file) ? await decryptToTemp(file, identities) : { file, cleanup: () => undefined };
  const admin = new pg.Client({ connectionString: adminUrl });
  await admin.connect();
  let created = false;
  try {
    const exists = await admin.query('SELECT 1 FROM pg_database WHERE datname = $1', [database]);
    if (exists.rowCount) throw new Error(`database ${database} already exists: restore into a fresh one`);
    await admin.query(`CREATE DATABASE ${database}`);
    created = true;
    const target = new URL(adminUrl);
    target.pathname = `/${database}`;
    const { url: bare, env } = withoutPassword(target.toString());
    const r = spawnSync(
      pgTool('pg_restore'),
      ['--no-owner', '--exit-on-error', '--single-transaction', '--dbname', bare, plain.file],
      { encoding: 'utf8', env },
    );
    if (r.status !== 0) throw new Error(`pg_restore failed: ${r.stderr || r.error?.message}`);
    return { database, url: target.toString() };
  } catch (err) {
    // a failed restore leaves no half-made database behind to be mistaken for a good one
    if (created) await admin.query(`DROP DATABASE IF EXISTS ${database}`);
    throw err;
  } finally {
    await admin.end();
    plain.cleanup();
  }
}

/** Rows in every table of the public schema, for comparing a restore with its source. */
export async function rowCounts(sequelize: Sequelize): Promise<Record<string, number>> {
  const tables = await sequelize.query<{ t: string }>(
    "SELECT tablename AS t FROM pg_tables WHERE schemaname = 'public' ORDER BY tablename",
    { type: QueryTypes.SELECT },
  );
  const out: Record<string, number> = {};
  for (const { t } of tables) {
    const [row] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM "${t}"`, {
      type: QueryTypes.SELECT,
    });
    out[t] = row!.n;
  }
  return out;
}
