import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';
import { pass, tornDownCore } from '../support/parts.js';

let t: TestApp;
let receiving: string;
let operator: string;

beforeAll(async () => {
  t = makeTestApp();
  receiving = await cookieFor(await makeUser('receiving'), t.config);
  operator = await cookieFor(await makeUser('operator'), t.config);
});
afterAll(() => t.close());

const queues = async () => {
  const res = await request(t.app).get('/api/station-queues').set('Cookie', operator);
  expect(res.status).toBe(200);
  return res.body as { code: string; waiting: number; rank: number }[];
};
const waitingAt = (rows: { code: string; waiting: number }[], code: string) =>
  rows.find((r) => r.code === code)!.waiting;

describe('the station chooser’s queues', () => {
  it('when a block is torn down, then block clean counts one more waiting; once recorded there, crack test does', async () => {
    // other files add parts at the same time: the count is compared as "at least one more", and
    // a part of this test's own is followed from one station's queue to the next
    const before = await queues();
    const { block } = await tornDownCore(t, { receiving, operator }, 'TARN-6');
    const after = await queues();
    expect(waitingAt(after, 'CLN-1')).toBeGreaterThanOrEqual(waitingAt(before, 'CLN-1') + 1);
    await pass(t, operator, 'CLN-1', block);
    const moved = await queues();
    expect(waitingAt(moved, 'MPI-1')).toBeGreaterThanOrEqual(waitingAt(after, 'MPI-1') + 1);
  });

  it('when listed, then stations come in route order: the dock before teardown, clean before crack test before pressure test, and bore and hone after line hone', async () => {
    // the demo's block route (db/seeders/plant.ts): clean, crack, pressure, line hone, bore and hone
    const rows = await queues();
    const at = (code: string) => rows.findIndex((r) => r.code === code);
    expect(at('DOCK-1')).toBeLessThan(at('TD-1'));
    expect(at('CLN-1')).toBeLessThan(at('MPI-1'));
    expect(at('MPI-1')).toBeLessThan(at('PT-1'));
    expect(at('LH-1')).toBeLessThan(at('BH-1'));
    expect(rows.map((r) => r.rank)).toEqual(rows.map((_, i) => i));
  });

  it('when someone without the station screen asks, then it is forbidden', async () => {
    const shipping = await cookieFor(await makeUser('shipping'), t.config);
    expect((await request(t.app).get('/api/station-queues').set('Cookie', shipping)).status).toBe(403);
  });
});
