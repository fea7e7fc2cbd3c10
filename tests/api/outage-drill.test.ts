import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ensureDatabase, freePort, startCluster, throwawayClusterDir, type Cluster } from '../../db/cluster.mjs';
import { seedDemoIfEmpty } from '../../db/seeders/demo.js';
import { migrate } from '../../server/migrate.js';
import { cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';
import { burst, firstStageSubmissions, tally } from '../support/drills.js';
import { startServer } from '../support/process.js';

// PostgreSQL stopped in the middle of a burst of station submissions, as a plant's database
// restart or failover would: a fast shutdown ends every session ("terminating connection due to
// administrator command"), then nothing answers for a few seconds. The API must answer 503 with
// Retry-After throughout (never a 500 a tablet would take as final), stay up, and carry on by
// itself; the clients, retrying with the same keys, must end with every result stored once.

const JWT = 'outage-drill-'.padEnd(40, 'x');
let dir: string;
let cluster: Cluster;
let t: TestApp;
let cookies: { receiving: string; operator: string };

beforeAll(async () => {
  dir = throwawayClusterDir();
  cluster = await startCluster({ dir, port: await freePort() });
  await ensureDatabase(cluster, 'drill');
  t = makeTestApp({ DATABASE_URL: cluster.url('drill'), JWT_SECRET: JWT });
  await migrate(t.sequelize);
  await seedDemoIfEmpty(t.sequelize, { bcryptCost: 4, history: false });
  cookies = {
    receiving: await cookieFor(await makeUser('receiving'), t.config),
    operator: await cookieFor(await makeUser('operator'), t.config),
  };
}, 120_000);

afterAll(async () => {
  await t?.close();
  cluster?.stop();
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
});

/** A fast shutdown, as `pg_ctl -m fast stop` sends it, without waiting: the burst goes on meanwhile. */
function fastShutdown(c: Cluster) {
  const pid = Number(fs.readFileSync(path.join(c.pgdata, 'postmaster.pid'), 'utf8').split('\n')[0]);
  process.kill(pid, 'SIGINT');
  return new Promise<void>((resolve) => {
    const timer = setInterval(() => {
      if (!fs.existsSync(path.join(c.pgdata, 'postmaster.pid'))) {
        clearInterval(timer);
        resolve();
      }
    }, 50);
  });
}

describe('PostgreSQL stopped mid-burst', () => {
  it('when the database stops and comes back during 150 submissions from 16 clients, then 0 × 500, nothing lost, nothing twice', async () => {
    const port = await freePort();
    const base = `http://127.0.0.1:${port}`;
    const server = startServer(port, { DATABASE_URL: cluster.url('drill'), JWT_SECRET: JWT });
    const subs = await firstStageSubmissions(t, cookies, 50);
    await server.ready;

    let replies = 0;
    let outage!: () => void;
    const outageDue = new Promise<void>((r) => (outage = r));
    const running = burst(base, cookies.operator, subs, {
      deadline: Date.now() + 90_000,
      onReply: () => ++replies === 20 && outage(),
    });
    // a fifth of the way in: the rest are queued or in flight
    await outageDue;
    await fastShutdown(cluster);
    const healthWhileDown = await fetch(`${base}/api/health`);
    await new Promise((r) => setTimeout(r, 3000));
    cluster = await startCluster({ dir, port: cluster.port });
    const b = await running;

    const counts = await tally(cluster.url('drill'), 'PostgreSQL stopped mid-burst', subs, b);
    expect(healthWhileDown.status).toBe(503);
    expect(b.outcomes.map((o) => o.status)).toEqual(subs.map(() => 201));
    expect(counts).toEqual({ submissions: 150, rows: 150, lost: 0, duplicated: 0, mismatched: 0 });
    // the drill did meet the outage, and the only 5xx it met is the promised one
    expect(b.fiveHundreds.get('503 unavailable')).toBeGreaterThan(0);
    expect([...b.fiveHundreds.keys()]).toEqual(['503 unavailable']);
    // no hang: a request while the database is away is answered within the connect timeout
    expect(b.longestMs).toBeLessThan(10_000);
    // the API stayed up throughout and carries on by itself
    expect(server.child.exitCode).toBeNull();
    expect((await fetch(`${base}/api/health`)).status).toBe(200);
    expect(server.output()).not.toMatch(/\binternal\b|Unhandled|uncaught/i);
    server.child.kill('SIGTERM');
    expect(await server.exited).toBe(0);
  }, 150_000);
});
