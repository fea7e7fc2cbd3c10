import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { afterAll, describe, expect, it } from 'vitest';
import { seedDemoIfEmpty } from '../../db/seeders/demo.js';
import { integrateAll } from '../../server/ledger/sequencer.js';
import { signerFromPem } from '../../server/ledger/signer.js';
import { verifyAudit } from '../../server/ledger/verify.js';
import { TEST_PLANT_KEY } from '../support/ledger.js';
import { createSequelize } from '../../server/db.js';
import { migrate } from '../../server/migrate.js';
import { backupDatabase, restoreDatabase, rowCounts } from '../../server/ops/backup.js';

// A seeded plant of its own (not the shared test database, which other files change meanwhile),
// backed up with pg_dump and restored into a fresh database: same rows, same intact audit chain.
const admin = process.env.ADMIN_DATABASE_URL!;
const src = `backup_src_${process.pid}`;
const dst = `backup_dst_${process.pid}`;
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'coretrail-backup-'));
const urlOf = (db: string) => {
  const u = new URL(admin);
  u.pathname = `/${db}`;
  return u.toString();
};

async function adminQuery(sql: string) {
  const c = new pg.Client({ connectionString: admin });
  await c.connect();
  try {
    await c.query(sql);
  } finally {
    await c.end();
  }
}

afterAll(async () => {
  await adminQuery(`DROP DATABASE IF EXISTS ${src} WITH (FORCE)`);
  await adminQuery(`DROP DATABASE IF EXISTS ${dst} WITH (FORCE)`);
  fs.rmSync(dir, { recursive: true, force: true });
});

describe('backup and restore', () => {
  it('round-trips a seeded plant: every table has the same rows and the audit log verifies', async () => {
    await adminQuery(`CREATE DATABASE ${src}`);
    const source = createSequelize(urlOf(src), { poolMax: 2 });
    try {
      await migrate(source);
      expect(await seedDemoIfEmpty(source, { bcryptCost: 4 })).toBe(true);
      await integrateAll(source, { signer: signerFromPem(TEST_PLANT_KEY) });
      const before = await rowCounts(source);
      expect(before.stage_results).toBeGreaterThan(50);
      expect(before.audit_events).toBeGreaterThan(100);
      const { file, bytes } = backupDatabase(urlOf(src), path.join(dir, 'plant.dump'));
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
});
