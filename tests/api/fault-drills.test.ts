import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freePort } from '../../db/cluster.mjs';
import { StageResult } from '../../server/models/index.js';
import { cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';
import { burst, firstStageSubmissions, tally } from '../support/drills.js';
import { tornDownCore } from '../support/parts.js';
import { startServer } from '../support/process.js';

// Fault drills, bounded in time: the API killed mid-burst, SIGTERM while requests are in flight
// (PostgreSQL stopped mid-burst is outage-drill.test.ts, on a cluster of its own). Each asserts what
// a plant relies on: nothing stored twice, nothing a client was told was saved is missing, and
// plain 503s instead of hangs or 500s.

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

describe('fault drills', () => {
  it('when the API is killed with SIGKILL mid-burst of 150 submissions from 16 clients and restarted, then every one is stored exactly once', async () => {
    const port = await freePort();
    const base = `http://127.0.0.1:${port}`;
    let server = startServer(port, { JWT_SECRET: JWT });
    const subs = await firstStageSubmissions(t, cookies, 50);
    await server.ready;
    let replies = 0;
    let killNow!: () => void;
    const killDue = new Promise<void>((r) => (killNow = r));
    const running = burst(base, cookies.operator, subs, {
      deadline: Date.now() + 90_000,
      onReply: () => ++replies === 20 && killNow(),
    });
    // a fifth of the way in: the rest are queued or in flight
    await killDue;
    server.child.kill('SIGKILL');
    await server.exited;
    server = startServer(port, { JWT_SECRET: JWT });
    await server.ready;
    const b = await running;
    server.child.kill('SIGTERM');
    expect(await server.exited).toBe(0);

    const counts = await tally(t.config.DATABASE_URL, 'API killed mid-burst', subs, b);
    expect(b.outcomes.map((o) => o.status)).toEqual(subs.map(() => 201));
    expect(counts).toEqual({ submissions: 150, rows: 150, lost: 0, duplicated: 0, mismatched: 0 });
    // the drill did interrupt work: some clients lost their connection and tried again
    expect(b.networkErrors).toBeGreaterThan(0);
    expect([...b.fiveHundreds.keys()].filter((k) => !k.startsWith('503 '))).toEqual([]);
  }, 150_000);

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
    // long enough for some to reach the handlers on a loaded machine, short enough to catch others on the way
    await new Promise((r) => setTimeout(r, 150));
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
});
