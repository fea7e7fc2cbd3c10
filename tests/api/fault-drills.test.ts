import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ensureDatabase, freePort, startCluster, throwawayClusterDir } from '../../db/cluster.mjs';
import { createApp } from '../../server/app.js';
import { createSequelize } from '../../server/db.js';
import { migrate } from '../../server/migrate.js';
import { Item, StageResult } from '../../server/models/index.js';
import { cookieFor, makeTestApp, makeUser, testConfig, type TestApp } from '../support/app.js';
import { tornDownCore } from '../support/parts.js';
import { startServer } from '../support/process.js';

// Fault drills, bounded in time: the API killed mid-burst, PostgreSQL stopped under load, SIGTERM
// while requests are in flight. Each asserts what a plant relies on: nothing stored twice,
// nothing a client was told was saved is missing, and plain 503s instead of hangs or 500s.

let t: TestApp;
let cookies: { receiving: string; operator: string };
const JWT = 'process-test-'.padEnd(40, 'x');

beforeAll(async () => {
  t = makeTestApp({ JWT_SECRET: JWT });
  cookies = {
    receiving: await cookieFor(await makeUser('receiving'), t.config),
    operator: await cookieFor(await makeUser('operator'), t.config),
  };
});
afterAll(() => t.close());

/** Blocks waiting at their first stage (block clean, one pass/fail check), with the body that records them. */
async function blocksAtClean(n: number) {
  const out: { serial: string; body: object; key: string }[] = [];
  for (let i = 0; i < n; i++) {
    const parts = await tornDownCore(t, cookies, 'TARN-6');
    const key = randomUUID();
    out.push({
      serial: parts.block,
      key,
      body: {
        idempotencyKey: key,
        serial: parts.block,
        station: 'CLN-1',
        readings: [{ characteristic: 'clean', passed: true }],
      },
    });
  }
  return out;
}

/** Posts until the server says 201 (or anything that is not a network error or 5xx). */
async function submitWithRetries(base: string, body: object, deadline: number, onReply?: () => void) {
  for (let attempt = 1; ; attempt++) {
    try {
      const res = await fetch(`${base}/api/results`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json', Cookie: cookies.operator },
        body: JSON.stringify(body),
      });
      if (res.status < 500) {
        onReply?.();
        return { status: res.status, attempts: attempt, body: (await res.json()) as { id: number } };
      }
    } catch {
      // connection refused or reset: the server is down; try again
    }
    if (Date.now() > deadline) throw new Error('gave up');
    await new Promise((r) => setTimeout(r, 100));
  }
}

describe('fault drills', () => {
  it('killed with SIGKILL mid-burst and restarted: every submission is stored exactly once, every success is there', async () => {
    const blocks = await blocksAtClean(16);
    const port = await freePort();
    const base = `http://127.0.0.1:${port}`;
    let server = startServer(port, { JWT_SECRET: JWT });
    await server.ready;
    const deadline = Date.now() + 45_000;
    let firstReply!: () => void;
    const first = new Promise<void>((r) => (firstReply = r));
    const burst = Promise.all(blocks.map((b) => submitWithRetries(base, b.body, deadline, firstReply)));
    // kill it the moment the first client hears back: the others are mid-request
    await first;
    server.child.kill('SIGKILL');
    await server.exited;
    server = startServer(port, { JWT_SECRET: JWT });
    await server.ready;
    const replies = await burst;
    server.child.kill('SIGTERM');
    expect(await server.exited).toBe(0);

    expect(replies.map((r) => r.status)).toEqual(blocks.map(() => 201));
    // the drill did interrupt work: some clients had to retry
    expect(replies.filter((r) => r.attempts > 1).length).toBeGreaterThan(0);
    for (const [i, b] of blocks.entries()) {
      const rows = await StageResult.findAll({ where: { idempotencyKey: b.key } });
      expect(rows).toHaveLength(1);
      expect(rows[0]!.id).toBe(replies[i]!.body.id);
      const item = (await Item.findOne({ where: { serial: b.serial } }))!;
      expect(await StageResult.count({ where: { itemId: item.id, stageId: rows[0]!.stageId } })).toBe(1);
    }
  }, 90_000);

  it('SIGTERM while requests are in flight: they finish, later ones are refused, and it exits 0', async () => {
    const blocks = await blocksAtClean(8);
    const port = await freePort();
    const base = `http://127.0.0.1:${port}`;
    const server = startServer(port, { JWT_SECRET: JWT });
    await server.ready;
    const inFlight = blocks.map((b) =>
      fetch(`${base}/api/results`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json', Cookie: cookies.operator },
        body: JSON.stringify(b.body),
      }).then(
        (r) => r.status,
        () => 'refused' as const,
      ),
    );
    await new Promise((r) => setTimeout(r, 40));
    server.child.kill('SIGTERM');
    const statuses = await Promise.all(inFlight);
    expect(await server.exited).toBe(0);
    // nothing half done: each request completed, or was turned away (503 while draining, or no connection)
    expect(statuses.filter((s) => s !== 201 && s !== 503 && s !== 'refused')).toEqual([]);
    expect(statuses.filter((s) => s === 201).length).toBeGreaterThan(0);
    for (const [i, b] of blocks.entries()) {
      expect(await StageResult.count({ where: { idempotencyKey: b.key } })).toBe(statuses[i] === 201 ? 1 : 0);
    }
    await expect(fetch(`${base}/api/health`)).rejects.toThrow();
  }, 60_000);

  it('PostgreSQL stopped under load: 503 with a plain message, no hang, no crash, and it recovers by itself', async () => {
    const dir = throwawayClusterDir();
    const port = await freePort();
    let cluster = await startCluster({ dir, port });
    try {
      await ensureDatabase(cluster, 'drill');
      const config = testConfig({ DATABASE_URL: cluster.url('drill') });
      const sequelize = createSequelize(config.DATABASE_URL, { poolMax: 3 });
      await migrate(sequelize);
      const app = createApp({ sequelize, config });
      let n = 0;
      // a different unknown person each time, so no sign-in limit is reached
      const hit = async () => {
        const started = Date.now();
        const res = await request(app)
          .post('/api/auth/login')
          .send({ email: `nobody${++n}@drill.example`, password: 'wrong password here' });
        return {
          status: res.status,
          code: res.body.error?.code as string,
          ms: Date.now() - started,
          message: res.body.error?.message as string,
        };
      };
      expect((await hit()).status).toBe(401);
      cluster.stop();
      const down = await Promise.all(Array.from({ length: 6 }, hit));
      for (const r of down) {
        expect(r.status).toBe(503);
        expect(r.message).toMatch(/database is not reachable/);
        expect(r.ms).toBeLessThan(10_000);
      }
      expect((await request(app).get('/api/health')).status).toBe(503);
      cluster = await startCluster({ dir, port });
      let health = await request(app).get('/api/health');
      for (let i = 0; i < 50 && health.status !== 200; i++) {
        await new Promise((r) => setTimeout(r, 200));
        health = await request(app).get('/api/health');
      }
      expect(health.status).toBe(200);
      expect((await hit()).status).toBe(401);
      await sequelize.close();
    } finally {
      cluster.stop();
      fs.rmSync(dir, { recursive: true, force: true });
    }
  }, 90_000);
});
