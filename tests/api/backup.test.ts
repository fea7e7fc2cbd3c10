import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemoIfEmpty } from '../../db/seeders/demo.js';
import { integrateAll } from '../../server/ledger/sequencer.js';
import { signerFromPem } from '../../server/ledger/signer.js';
import { verifyAudit } from '../../server/ledger/verify.js';
import { TEST_PLANT_KEY } from '../support/ledger.js';
import { adminQuery, databaseUrl } from '../support/own-database.js';
import { createSequelize } from '../../server/db.js';
import { migrate } from '../../server/migrate.js';
import { makeBackupKey, readIdentities, readRecipients } from '../../server/ops/backup-keys.js';
import { backupDatabase, restoreDatabase, rowCounts } from '../../server/ops/backup.js';

// A seeded plant of its own (not the shared test database, which other files change meanwhile),
// backed up with pg_dump and restored into a fresh database: same rows, same intact audit log.
const src = `backup_src_${process.pid}`;
const dst = `backup_dst_${process.pid}`;
const sealed = `backup_sealed_${process.pid}`;
const cut = `backup_cut_${process.pid}`;
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'coretrail-backup-'));
const admin = process.env.ADMIN_DATABASE_URL!;
const urlOf = databaseUrl;

afterAll(async () => {
  await adminQuery(`DROP DATABASE IF EXISTS ${src} WITH (FORCE)`);
  await adminQuery(`DROP DATABASE IF EXISTS ${dst} WITH (FORCE)`);
  await adminQuery(`DROP DATABASE IF EXISTS ${sealed} WITH (FORCE)`);
  await adminQuery(`DROP DATABASE IF EXISTS ${cut} WITH (FORCE)`);
  fs.rmSync(dir, { recursive: true, force: true });
});

const mode = (p: string) => fs.statSync(p).mode & 0o777;

beforeAll(async () => {
  await adminQuery(`CREATE DATABASE ${src}`);
  const source = createSequelize(urlOf(src), { poolMax: 2 });
  try {
    await migrate(source);
    expect(await seedDemoIfEmpty(source, { bcryptCost: 4, history: false })).toBe(true);
    await integrateAll(source, { signer: signerFromPem(TEST_PLANT_KEY) });
  } finally {
    await source.close();
  }
}, 120_000);

describe('backup and restore', () => {
  it('round-trips a seeded plant: every table has the same rows and the audit log verifies', async () => {
    const source = createSequelize(urlOf(src), { poolMax: 2 });
    try {
      const before = await rowCounts(source);
      expect(before.stage_results).toBeGreaterThan(50);
      expect(before.audit_events).toBeGreaterThan(100);
      const { file, bytes } = await backupDatabase(urlOf(src), path.join(dir, 'plant.dump'));
      expect(bytes).toBeGreaterThan(10_000);

      const restored = await restoreDatabase(admin, file, dst);
      const copy = createSequelize(restored.url, { poolMax: 2 });
      try {
        expect(await rowCounts(copy)).toEqual(before);
        const audit = await verifyAudit(copy, { signer: signerFromPem(TEST_PLANT_KEY) });
        expect(audit).toMatchObject({ ok: true, checked: before.audit_events, firstBroken: null });
        expect(audit.heads.checked).toBe(1);
        // the restored copy keeps refusing edits to records
        await expect(copy.query('UPDATE readings SET value = 0')).rejects.toThrow(/records/);
      } finally {
        await copy.close();
      }
      // never over an existing database
      await expect(restoreDatabase(admin, file, dst)).rejects.toThrow(/already exists/);
    } finally {
      await source.close();
    }
  }, 120_000);

  it('when a backup is written, then only its owner can read it (0600) or enter its folder (0700)', async () => {
    // it holds password hashes and sessions
    const { file } = await backupDatabase(urlOf(src), path.join(dir, 'nightly', 'plant.dump'));
    expect(mode(file).toString(8)).toBe('600');
    expect(mode(path.dirname(file)).toString(8)).toBe('700');
  }, 60_000);

  it('when the backup folder exists and others may enter it, then it is closed to them (0700) before anything is written', async () => {
    const loose = path.join(dir, 'loose');
    fs.mkdirSync(loose, { mode: 0o755 });
    fs.chmodSync(loose, 0o755);
    const { file } = await backupDatabase(urlOf(src), path.join(loose, 'plant.dump'));
    expect(mode(loose).toString(8)).toBe('700');
    expect(mode(file).toString(8)).toBe('600');
  }, 60_000);

  it("when encrypted to the plant's key, then the file reads as age and no dump, restores only with that key, and matches its source", async () => {
    const keyFile = path.join(dir, 'plant-key.txt');
    const recipient = await makeBackupKey(keyFile);
    expect(mode(keyFile).toString(8)).toBe('600');
    const pubFile = path.join(dir, 'recipients.txt');
    fs.writeFileSync(pubFile, `# the plant's backup key\n${recipient}\n`);
    const { file, encrypted } = await backupDatabase(urlOf(src), path.join(dir, 'sealed', 'plant.dump.age'), {
      recipients: readRecipients(pubFile),
    });
    expect(encrypted).toBe(true);
    expect(mode(file).toString(8)).toBe('600');
    const bytes = fs.readFileSync(file);
    // age-encryption.org/v1 (the age format's specification): the header's first line, then a
    // stanza per recipient; pg_dump's custom format begins "PGDMP" (pg_backup_archiver.c), which
    // must not appear in the clear, nor any e-mail address of the plant's people
    expect(bytes.subarray(0, 22).toString()).toBe('age-encryption.org/v1\n');
    expect(bytes.subarray(22, 32).toString()).toBe('-> X25519 ');
    expect(bytes.includes('PGDMP')).toBe(false);
    expect(bytes.includes('@larkspur.example')).toBe(false);

    // without the key, or with another one: a plain refusal, and no database left behind
    await expect(restoreDatabase(admin, file, sealed)).rejects.toThrow(/is encrypted: give the plant's backup key/);
    const otherKey = path.join(dir, 'other-key.txt');
    await makeBackupKey(otherKey);
    await expect(restoreDatabase(admin, file, sealed, { identities: readIdentities(otherKey) })).rejects.toThrow(
      /could not be decrypted/,
    );
    const c = new pg.Client({ connectionString: admin });
    await c.connect();
    expect((await c.query('SELECT 1 FROM pg_database WHERE datname = $1', [sealed])).rowCount).toBe(0);
    await c.end();

    const source = createSequelize(urlOf(src), { poolMax: 2 });
    const before = await rowCounts(source).finally(() => source.close());
    const restored = await restoreDatabase(admin, file, sealed, { identities: readIdentities(keyFile) });
    const copy = createSequelize(restored.url, { poolMax: 2 });
    try {
      expect(await rowCounts(copy)).toEqual(before);
      expect(await verifyAudit(copy, { signer: signerFromPem(TEST_PLANT_KEY) })).toMatchObject({
        ok: true,
        checked: before.audit_events,
      });
    } finally {
      await copy.close();
    }
  }, 120_000);

  it('when an encrypted backup is cut short, or a file is no dump, then the restore refuses it and leaves no database', async () => {
    const keyFile = path.join(dir, 'cut-key.txt');
    const recipient = await makeBackupKey(keyFile);
    const { file } = await backupDatabase(urlOf(src), path.join(dir, 'cut', 'plant.dump.age'), {
      recipients: [recipient],
    });
    fs.truncateSync(file, fs.statSync(file).size - 100);
    await expect(restoreDatabase(admin, file, cut, { identities: readIdentities(keyFile) })).rejects.toThrow(
      /could not be decrypted/,
    );
    // a file that decrypts, or needs no decrypting, but is no dump: pg_restore fails after the
    // database was made, and it is dropped again
    const junk = path.join(dir, 'junk.dump');
    fs.writeFileSync(junk, 'PGDMP but not really a dump\n', { mode: 0o600 });
    await expect(restoreDatabase(admin, junk, cut)).rejects.toThrow(/pg_restore failed/);
    const c = new pg.Client({ connectionString: admin });
    await c.connect();
    expect((await c.query('SELECT 1 FROM pg_database WHERE datname = $1', [cut])).rowCount).toBe(0);
    await c.end();
  }, 60_000);
});
