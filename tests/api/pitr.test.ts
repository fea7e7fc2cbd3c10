import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ensureDatabase, freePort, startCluster, throwawayClusterDir, type Cluster } from '../../db/cluster.mjs';
import { seedDemoIfEmpty } from '../../db/seeders/demo.js';
import { integrateAll } from '../../server/ledger/sequencer.js';
import { signerFromPem } from '../../server/ledger/signer.js';
import { verifyAudit } from '../../server/ledger/verify.js';
import { TEST_PLANT_KEY } from '../support/ledger.js';
import { createSequelize } from '../../server/db.js';
import { migrate } from '../../server/migrate.js';
import { archiveStatus, flushArchive, restoreToTime, takeBaseBackup } from '../../server/ops/pitr.js';
import { cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';
import { firstStageSubmissions, type Submission } from '../support/drills.js';

// Point-in-time recovery, end to end: a cluster set up as a plant turns archiving on, a base
// backup, results recorded through the API, a time noted, more results, then a restore of the base
// backup into a fresh cluster, replayed from the WAL archive up to the noted time. Exactly the
// results before the time must be there, and the audit log must verify.

let dir: string;
let restoredDir: string;
let scratch: string;
let cluster: Cluster;
let restored: Cluster | undefined;
let t: TestApp;
let cookies: { receiving: string; operator: string };

beforeAll(async () => {
  dir = throwawayClusterDir();
  restoredDir = throwawayClusterDir();
  scratch = fs.mkdtempSync(path.join(os.tmpdir(), 'coretrail-pitr-'));
  cluster = await startCluster({ dir, port: await freePort(), walArchive: path.join(dir, 'wal-archive') });
  await ensureDatabase(cluster, 'drill');
  t = makeTestApp({ DATABASE_URL: cluster.url('drill') });
  await migrate(t.sequelize);
  await seedDemoIfEmpty(t.sequelize, { bcryptCost: 4, history: false });
  cookies = {
    receiving: await cookieFor(await makeUser('receiving'), t.config),
    operator: await cookieFor(await makeUser('operator'), t.config),
  };
}, 120_000);

afterAll(async () => {
  await t?.close();
  restored?.stop();
  cluster?.stop();
  for (const d of [dir, restoredDir, scratch]) if (d) fs.rmSync(d, { recursive: true, force: true });
});

async function record(subs: Submission[]) {
  for (const s of subs) {
    const res = await request(t.app).post('/api/results').set('Cookie', cookies.operator).send(s.body);
    if (res.status !== 201) throw new Error(`record failed: ${res.status} ${JSON.stringify(res.body)}`);
  }
}

const count = async (sql: string) => {
  const [row] = await t.sequelize.query<{ n: number }>(sql, { type: QueryTypes.SELECT });
  return row!.n;
};

describe('point-in-time recovery', () => {
  it('when restored to a noted time, then exactly the results recorded before it are there and the audit log verifies', async () => {
    const url = cluster.url('drill');
    expect((await archiveStatus(url)).mode).toBe('on');
    const subs = await firstStageSubmissions(t, cookies, 4);
    const before = subs.slice(0, 6);
    const after = subs.slice(6);

    const base = await takeBaseBackup(url, path.join(scratch, 'base'));
    expect((fs.statSync(base.dir).mode & 0o777).toString(8)).toBe('700');
    expect((fs.statSync(path.join(base.dir, 'base.tar.gz')).mode & 0o777).toString(8)).toBe('600');
    // a WAL segment name: timeline, log and segment, 8 hexadecimal digits each (PostgreSQL's xlog_internal.h)
    expect(base.startWal).toMatch(/^[0-9A-F]{24}$/);
    await record(before);
    const expected = {
      results: await count('SELECT count(*)::int AS n FROM stage_results'),
      events: await count('SELECT count(*)::int AS n FROM audit_events'),
    };
    // the time noted comes from the database's clock, which stamps the commits
    await new Promise((r) => setTimeout(r, 5)); // the noted time is kept to the millisecond
    const [{ now: noted }] = (await t.sequelize.query<{ now: Date }>('SELECT clock_timestamp() AS now', {
      type: QueryTypes.SELECT,
    })) as [{ now: Date }];
    await record(after);
    await flushArchive(url);

    const started = Date.now();
    const r = await restoreToTime({
      base: base.dir,
      archiveDir: path.join(dir, 'wal-archive'),
      targetTime: new Date(noted),
      dir: restoredDir,
      port: await freePort(),
      credentialsFile: path.join(dir, 'credentials.json'),
    });
    restored = r.cluster;
    const seconds = (Date.now() - started) / 1000;

    const copy = createSequelize(restored.url('drill'), { poolMax: 1 });
    try {
      const keysIn = async (s: Submission[]) => {
        const [row] = await copy.query<{ n: number }>(
          'SELECT count(*)::int AS n FROM stage_results WHERE idempotency_key IN (:keys)',
          { type: QueryTypes.SELECT, replacements: { keys: s.map((x) => x.key) } },
        );
        return row!.n;
      };
      const [totals] = await copy.query<{ results: number; events: number }>(
        `SELECT (SELECT count(*)::int FROM stage_results) AS results, (SELECT count(*)::int FROM audit_events) AS events`,
        { type: QueryTypes.SELECT },
      );
      const kept = await keysIn(before);
      const extra = await keysIn(after);
      // the restored plant's sequencer takes up the events still waiting, then the whole log is checked
      const signer = signerFromPem(TEST_PLANT_KEY);
      await integrateAll(copy, { signer });
      const audit = await verifyAudit(copy, { signer });
      process.stdout.write(
        `[drill] point-in-time recovery: ${before.length} submissions before the noted time, ${after.length} after; ` +
          `restored ${kept} and ${extra} (${before.length - kept} lost, ${extra} too many), ${totals!.results} results in all; ` +
          `audit log ${audit.ok ? 'intact' : 'BROKEN'}, ${audit.checked} events in the log and ${audit.log.pending} waiting; restore took ${seconds.toFixed(1)} s\n`,
      );
      expect(kept).toBe(before.length);
      expect(extra).toBe(0);
      expect(totals).toEqual(expected);
      expect(audit).toMatchObject({ ok: true, firstBroken: null, checked: expected.events });
      expect(audit.log.pending).toBe(0);
      // the restored cluster is a new, writable primary that does not write into the source's archive
      expect((await copy.query('SELECT pg_is_in_recovery() AS r', { type: QueryTypes.SELECT }))[0]).toEqual({
        r: false,
      });
      expect((await copy.query("SELECT current_setting('archive_mode') AS m", { type: QueryTypes.SELECT }))[0]).toEqual(
        { m: 'off' },
      );
    } finally {
      await copy.close();
    }
  }, 180_000);

  it('when asked for a time before the base backup ended, then it refuses in plain words and makes nothing', async () => {
    const base = await takeBaseBackup(cluster.url('drill'), path.join(scratch, 'base'));
    const into = path.join(scratch, 'too-early');
    await expect(
      restoreToTime({
        base: base.dir,
        archiveDir: path.join(dir, 'wal-archive'),
        targetTime: new Date(Date.parse(base.startedAt) - 60_000),
        dir: into,
        port: await freePort(),
        credentialsFile: path.join(dir, 'credentials.json'),
      }),
    ).rejects.toThrow(/choose a time after it, or an older base backup/);
    expect(fs.existsSync(into)).toBe(false);
  }, 60_000);
});
