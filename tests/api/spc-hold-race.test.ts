import { setTimeout as sleep } from 'node:timers/promises';
import request from 'supertest';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Customer } from '../../server/models/index.js';
import { TEST_PASSWORD, cookieFor, makeUser, type TestApp } from '../support/app.js';
import { expectCommitTimestamps, ownDatabase } from '../support/own-database.js';
import { cloneUnits, type UnitCopy } from '../support/clone-units.js';
import { plantToday, releasableUnit } from '../support/parts.js';

/**
 * A control chart signal's hold is one more path that can stop a unit shipping, so it keeps the lock
 * protocol (server/services/unit-locks.ts): a unit never ships with a hold that was already open
 * when its release committed. Each pair fires a release of a unit and a hold of a signal on its
 * block at random offsets of −20 to +20 ms; PostgreSQL's commit timestamps judge the order. In a
 * database of its own, as the release race is: its holds and their mail stay out of the shared one.
 */
const PAIRS = 60;

let t: TestApp;
let drop: (() => Promise<void>) | undefined;
let shipping: string;
let supervisor: string;
let customerId: number;
let copies: UnitCopy[];
const signalOf = new Map<string, number>();

beforeAll(async () => {
  ({ t, drop } = await ownDatabase('spc_hold_race'));
  await expectCommitTimestamps(t);
  const cookies = {
    receiving: await cookieFor(await makeUser('receiving'), t.config),
    operator: await cookieFor(await makeUser('operator'), t.config),
  };
  shipping = await cookieFor(await makeUser('shipping', { quickSignature: true }), t.config);
  const sup = await makeUser('supervisor');
  supervisor = await cookieFor(sup, t.config);
  customerId = (await Customer.findOne({ order: [['id', 'ASC']] }))!.id;
  const { unit } = await releasableUnit(t, cookies, 'TARN-6', `SPCRACE${Date.now().toString(36).toUpperCase()}`);
  copies = await cloneUnits(t.sequelize, unit, PAIRS);

  // frozen limits on the six's bores, and a signal on each copy's bore-and-hone result
  const q = <T extends object>(sql: string, replacements: Record<string, unknown>) =>
    t.sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements });
  const [limits] = await q<{ id: number }>(
    `INSERT INTO spc_limits (engine_family_id, characteristic_id, method, limits, baseline_from, baseline_to,
                             baseline_points, reason, frozen_by_id)
     SELECT f.id, c.id, 'part-means', :limits, now() - interval '30 days', now(), 20, 'Race drill baseline', :by
       FROM engine_families f, characteristics c JOIN stages s ON s.id = c.stage_id
      WHERE f.code = 'TARN-6' AND s.code = 'bore-hone' AND c.code = 'bore'
     RETURNING id`,
    {
      limits: JSON.stringify({
        method: 'part-means',
        n: 36,
        baselineCount: 20,
        mean: 3.7205,
        mrBar: 1e-4,
        within: 's',
        withinBar: 5e-5,
      }),
      by: sup.id,
    },
  );
  for (const copy of copies) {
    const block = copy.parts.find((p) => p.kind === 'block')!.serial;
    const [signal] = await q<{ id: number }>(
      `INSERT INTO spc_signals (spc_limits_id, stage_result_id, item_id, chart, rule, value, centre, lower_limit, upper_limit)
       SELECT :limits, r.id, i.id, 'part-mean', 1, 3.7209, 3.7205, 3.7202, 3.7208
         FROM items i JOIN stage_results r ON r.item_id = i.id JOIN stages s ON s.id = r.stage_id AND s.code = 'bore-hone'
        WHERE i.serial = :block
       RETURNING id`,
      { limits: limits!.id, block },
    );
    signalOf.set(copy.unit, signal!.id);
  }
}, 300_000);
afterAll(async () => {
  await drop?.();
});

async function after<T>(ms: number, fn: () => PromiseLike<T>): Promise<T> {
  if (ms > 0) await sleep(ms);
  return fn();
}

describe('release against a control chart hold, raced', () => {
  it(`when ${PAIRS} releases race holds of a signal on the unit's block, then no unit ships with a hold open before it shipped`, async () => {
    let shipped = 0;
    let refused = 0;
    const wrong: string[] = [];
    for (let n = 0; n < PAIRS; n++) {
      const copy = copies[n]!;
      const offset = Math.round(Math.random() * 40 - 20);
      const [rel, hold] = await Promise.all([
        after(offset, () =>
          request(t.app)
            .post(`/api/units/${copy.unit}/release`)
            .set('Cookie', shipping)
            .send({ customerId, reference: `SPCRACE-${n}`, shipDate: plantToday(), password: TEST_PASSWORD }),
        ),
        after(-offset, () =>
          request(t.app)
            .post(`/api/spc/signals/${signalOf.get(copy.unit)}/hold`)
            .set('Cookie', supervisor)
            .send({ reason: 'Bore mean above the control limit' }),
        ),
      ]);
      expect(hold.status, JSON.stringify(hold.body)).toBe(200);
      const ncr = hold.body.ncr as string;
      if (rel.status === 201) {
        shipped += 1;
        const [order] = await t.sequelize.query<{ ncr_first: boolean }>(
          `SELECT pg_xact_commit_timestamp(n.xmin) < pg_xact_commit_timestamp(s.xmin) AS ncr_first
             FROM shipments s, nonconformances n WHERE s.reference = :ref AND n.number = :number`,
          { type: QueryTypes.SELECT, replacements: { ref: `SPCRACE-${n}`, number: ncr } },
        );
        if (order!.ncr_first) wrong.push(`${copy.unit} shipped after ${ncr} held its block`);
      } else {
        expect(rel.status, JSON.stringify(rel.body)).toBe(409);
        const reasons = (rel.body.error.reasons as { message: string }[]).map((r) => r.message).join(' ');
        expect(reasons, `pair ${n}`).toContain(ncr);
        refused += 1;
      }
    }
    console.log('spc hold race:', JSON.stringify({ shipped, refused }));
    expect(wrong).toEqual([]);
    // both orders happened, so the drill raced for real
    expect(shipped).toBeGreaterThan(0);
    expect(refused).toBeGreaterThan(0);
  }, 600_000);
});
