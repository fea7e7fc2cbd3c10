import fs from 'node:fs';
import { QueryTypes, type Sequelize } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  ensureDatabase,
  freePort,
  startCluster,
  startStandby,
  throwawayClusterDir,
  type Cluster,
} from '../../db/cluster.mjs';
import { seedDemoIfEmpty } from '../../db/seeders/demo.js';
import { createApp } from '../../server/app.js';
import { createSequelize } from '../../server/db.js';
import { migrate } from '../../server/migrate.js';
import type { LotLookupJson, TrailJson } from '../../shared/schemas/trail.js';
import type { WipJson } from '../../shared/schemas/line.js';
import { cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';
import { firstStageSubmissions, type Submission } from '../support/drills.js';

// A plant's second server: a real hot standby of a primary, made with pg_basebackup and fed by
// streaming replication, as docs/operations.md tells a plant to set one up. With it named, the
// trail and the lot lookup read there and say how far behind the primary they may be. To show
// that the reads really go to the standby, its replay is paused (pg_wal_replay_pause, the
// manual's "Recovery Control Functions"): a result recorded meanwhile is on the primary only, the
// trail does not have it and says it is behind; once replay resumes and the lag it reports is 0,
// the trail has it.

let primaryDir: string;
let standbyDir: string;
let primary: Cluster;
let standby: Cluster;
let t: TestApp;
let readDb: Sequelize;
let onStandby: ReturnType<typeof createApp>;
let cookies: { receiving: string; operator: string; warranty: string; supervisor: string };
let subs: Submission[];

const one = async <T extends object>(db: Sequelize, sql: string): Promise<T> =>
  (await db.query<T>(sql, { type: QueryTypes.SELECT }))[0]!;

/** Waits until the standby has received (or replayed) the primary's WAL up to now. */
async function standbyHas(what: 'received' | 'replayed') {
  const { lsn } = await one<{ lsn: string }>(t.sequelize, 'SELECT pg_current_wal_lsn()::text AS lsn');
  const fn = what === 'received' ? 'pg_last_wal_receive_lsn()' : 'pg_last_wal_replay_lsn()';
  for (let i = 0; i < 200; i++) {
    const { ok } = await one<{ ok: boolean }>(readDb, `SELECT ${fn} >= '${lsn}'::pg_lsn AS ok`);
    if (ok) return;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`the standby never ${what} ${lsn}`);
}

beforeAll(async () => {
  primaryDir = throwawayClusterDir();
  standbyDir = throwawayClusterDir();
  primary = await startCluster({ dir: primaryDir, port: await freePort() });
  await ensureDatabase(primary, 'plant');
  t = makeTestApp({ DATABASE_URL: primary.url('plant') });
  await migrate(t.sequelize);
  await seedDemoIfEmpty(t.sequelize, { bcryptCost: 4, history: false });
  standby = await startStandby({ primary, dir: standbyDir, port: await freePort() });
  readDb = createSequelize(standby.url('plant'), { poolMax: 3, models: false });
  onStandby = createApp({ sequelize: t.sequelize, config: t.config, read: { db: readDb, standby: true } });
  cookies = {
    receiving: await cookieFor(await makeUser('receiving'), t.config),
    operator: await cookieFor(await makeUser('operator'), t.config),
    warranty: await cookieFor(await makeUser('warranty'), t.config),
    supervisor: await cookieFor(await makeUser('supervisor'), t.config),
  };
  subs = await firstStageSubmissions(t, cookies, 1);
}, 180_000);

afterAll(async () => {
  await readDb?.close();
  await t?.close();
  standby?.stop();
  primary?.stop();
  for (const d of [standbyDir, primaryDir]) if (d) fs.rmSync(d, { recursive: true, force: true });
});

describe('reads from a hot standby', () => {
  it('when a standby is made with pg_basebackup, then it is in recovery, streaming from the primary, and refuses writes', async () => {
    expect((await one<{ r: boolean }>(readDb, 'SELECT pg_is_in_recovery() AS r')).r).toBe(true);
    const receiver = await one<{ status: string }>(readDb, 'SELECT status FROM pg_stat_wal_receiver');
    expect(receiver.status).toBe('streaming');
    await expect(readDb.query("UPDATE plant_settings SET name = 'x'")).rejects.toThrow(/read-only transaction/);
  });

  it('when replay is paused, then the trail read there lacks a new result and says how far behind it is; after replay, it has it', async () => {
    const [sub] = subs;
    await standbyHas('replayed');
    const trail = async () => {
      const res = await request(onStandby).get(`/api/trail/${sub!.serial}`).set('Cookie', cookies.warranty);
      expect(res.status).toBe(200);
      return res.body as TrailJson;
    };
    const before = await trail();
    expect(before.readFrom.source).toBe('standby');
    const stageOf = async (app: typeof onStandby) => {
      const res = await request(app).get('/api/line/wip').set('Cookie', cookies.supervisor);
      expect(res.status).toBe(200);
      expect((res.body as WipJson).readFrom.source).toBe(app === onStandby ? 'standby' : 'primary');
      return (res.body as WipJson).items.find((i) => i.serial === sub!.serial)?.stageCode ?? null;
    };
    const stageBefore = await stageOf(onStandby);
    expect(stageBefore).not.toBeNull();

    await readDb.query('SELECT pg_wal_replay_pause()');
    try {
      const rec = await request(t.app).post('/api/results').set('Cookie', cookies.operator).send(sub!.body);
      expect(rec.status).toBe(201);
      await standbyHas('received');
      await new Promise((r) => setTimeout(r, 1100));
      const behind = await trail();
      // the primary has the result; the standby, paused, does not, and says it may be behind
      const onPrimary = (await request(t.app).get(`/api/trail/${sub!.serial}`).set('Cookie', cookies.warranty))
        .body as TrailJson;
      expect(onPrimary.readFrom).toMatchObject({ source: 'primary', lagSeconds: 0 });
      expect(onPrimary.results.length).toBe(before.results.length + 1);
      expect(behind.results.length).toBe(before.results.length);
      expect(behind.readFrom.lagSeconds).toBeGreaterThanOrEqual(1);
      expect(Date.parse(behind.readFrom.asOf)).toBeLessThan(Date.now() - 1000);
      // the line's boards read there too: the part still waits at its first stage on the standby
      expect(await stageOf(onStandby)).toBe(stageBefore);
      expect(await stageOf(t.app)).not.toBe(stageBefore);
    } finally {
      await readDb.query('SELECT pg_wal_replay_resume()');
    }
    // the lag falls to 0 once the standby has replayed what it received; then the result is there
    let after = await trail();
    for (let i = 0; i < 100 && after.readFrom.lagSeconds > 0; i++) {
      await new Promise((r) => setTimeout(r, 50));
      after = await trail();
    }
    expect(after.readFrom.lagSeconds).toBe(0);
    expect(after.results.length).toBe(before.results.length + 1);
  });

  it('when a lot is looked up with a standby set, then the answer says it came from the standby', async () => {
    const [lot] = await t.sequelize.query<{ lot_code: string }>('SELECT lot_code FROM part_lots ORDER BY id LIMIT 1', {
      type: QueryTypes.SELECT,
    });
    await standbyHas('replayed');
    const res = await request(onStandby).get(`/api/lots/${lot!.lot_code}`).set('Cookie', cookies.warranty);
    expect(res.status).toBe(200);
    expect((res.body as LotLookupJson).readFrom.source).toBe('standby');
    expect((res.body as LotLookupJson).lots.length).toBeGreaterThan(0);
  });
});
