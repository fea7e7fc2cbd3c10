import { setTimeout as sleep } from 'node:timers/promises';
import request from 'supertest';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Customer } from '../../server/models/index.js';
import type { ContainmentJson } from '../../shared/schemas/gauges.js';
import { TEST_PASSWORD, cookieFor, makeUser, type TestApp } from '../support/app.js';
import { expectCommitTimestamps, ownDatabase } from '../support/own-database.js';
import { cloneUnits, type UnitCopy } from '../support/clone-units.js';
import { plantToday, releasableUnit } from '../support/parts.js';

/**
 * The blast radius's one signed step is one more path that can stop a unit shipping, so it keeps
 * the lock protocol (server/services/unit-locks.ts): no unit ships after a containment that reaches
 * it has committed. Each pair fires a release of a unit and a containment whose blast radius
 * reaches it — by a gauge that read its block's bores, or by a lot that went into it — at random
 * offsets of −20 to +20 ms; PostgreSQL's commit timestamps judge which committed first. In a
 * database of its own, as the other race drills are: its NCRs and their mail stay out of the
 * shared one.
 */
const PAIRS = 60;
const TRIGGERS = ['gauge', 'lot'] as const;
type Trigger = (typeof TRIGGERS)[number];

let t: TestApp;
let drop: (() => Promise<void>) | undefined;
let shipping: string;
let quality: string;
let customerId: number;
let copies: UnitCopy[];
const gaugeOf = new Map<string, string>();

beforeAll(async () => {
  ({ t, drop } = await ownDatabase('containment_race'));
  const cookies = {
    receiving: await cookieFor(await makeUser('receiving'), t.config),
    operator: await cookieFor(await makeUser('operator'), t.config),
  };
  shipping = await cookieFor(await makeUser('shipping', { quickSignature: true }), t.config);
  quality = await cookieFor(await makeUser('quality', { quickSignature: true }), t.config);
  customerId = (await Customer.findOne({ order: [['id', 'ASC']] }))!.id;
  await expectCommitTimestamps(t);
  const { unit } = await releasableUnit(t, cookies, 'TARN-6', `CTRACE${Date.now().toString(36).toUpperCase()}`);
  copies = await cloneUnits(t.sequelize, unit, PAIRS);

  // a gauge of each copy's own, with the template block's bore readings copied onto the copy's
  // bore-and-hone result as taken with it (the copies carry results, not readings)
  for (const [n, copy] of copies.entries()) {
    const code = `RG-${n}`;
    const reg = await request(t.app)
      .post('/api/gauges')
      .set('Cookie', quality)
      .send({
        code,
        description: `Race drill bore gauge ${n}`,
        kind: 'bore gauge',
        unit: 'in',
        resolution: 0.0001,
        rangeLow: 3,
        rangeHigh: 6,
        intervalDays: 180,
      });
    expect(reg.status, JSON.stringify(reg.body)).toBe(201);
    gaugeOf.set(copy.unit, code);
    const block = copy.parts.find((p) => p.kind === 'block')!.serial;
    const [copied] = await t.sequelize.query<{ n: number }>(
      `WITH made AS (
         INSERT INTO readings (stage_result_id, characteristic_id, position, value, passed, unit, verdict,
                               tolerance_rule_id, rule_version, gauge_id, created_at)
         SELECT mine.id, r.characteristic_id, r.position, r.value, r.passed, r.unit, r.verdict,
                r.tolerance_rule_id, r.rule_version, (SELECT id FROM gauges WHERE code = :code), now()
           FROM items b JOIN stage_results mine ON mine.item_id = b.id
           JOIN stages st ON st.id = mine.stage_id AND st.code = 'bore-hone'
           JOIN stage_results tmpl ON tmpl.stage_id = mine.stage_id
           JOIN items tb ON tb.id = tmpl.item_id AND tb.kind = 'block'
           JOIN item_links l ON l.child_item_id = tb.id AND l.link_type = 'installed_in' AND l.removed_at IS NULL
           JOIN items tu ON tu.id = l.parent_item_id AND tu.serial = :template
           JOIN readings r ON r.stage_result_id = tmpl.id
          WHERE b.serial = :block
         RETURNING 1)
       SELECT count(*)::int AS n FROM made`,
      { type: QueryTypes.SELECT, replacements: { code, block, template: unit } },
    );
    expect(copied!.n).toBeGreaterThan(0);
  }
}, 300_000);
afterAll(async () => {
  await drop?.();
});

function contain(trigger: Trigger, copy: UnitCopy, n: number) {
  return request(t.app)
    .post('/api/containments')
    .set('Cookie', quality)
    .send({
      trigger: trigger === 'gauge' ? { gauge: gaugeOf.get(copy.unit) } : { lot: copy.lots[n % copy.lots.length] },
      reason: `Race drill ${n}: ${trigger} found bad`,
      defectCode: 'OOT',
      fieldActions: true,
      password: TEST_PASSWORD,
    });
}

function release(copy: UnitCopy, n: number) {
  return request(t.app)
    .post(`/api/units/${copy.unit}/release`)
    .set('Cookie', shipping)
    .send({ customerId, reference: `CTRACE-${n}`, shipDate: plantToday(), password: TEST_PASSWORD });
}

async function after<T>(ms: number, fn: () => PromiseLike<T>): Promise<T> {
  if (ms > 0) await sleep(ms);
  return fn();
}

describe('release against the blast radius’s one-step hold, raced', () => {
  it(`when ${PAIRS} releases race containments by a gauge or a lot that reach the unit, then no release commits after the hold`, async () => {
    const tally = Object.fromEntries(TRIGGERS.map((k) => [k, { shipped: 0, refused: 0, wrong: 0 }]));
    const wrong: string[] = [];
    // Which request takes the unit's lock first depends on how long each works before it asks for
    // it, and that differs by machine and by trigger. A staircase keeps the pairs at the crossing:
    // each release that wins gives the next hold of that trigger a 5 ms longer head start, each
    // hold that wins takes 5 ms away; the random offset races them around that point.
    const lead = Object.fromEntries(TRIGGERS.map((k) => [k, 0]));
    const took = Object.fromEntries(TRIGGERS.map((k) => [k, { hold: 0, release: 0, n: 0 }]));
    const timed = async <T>(fn: () => PromiseLike<T>) => {
      const start = performance.now();
      const value = await fn();
      return { value, ms: performance.now() - start };
    };
    for (let n = 0; n < PAIRS; n++) {
      const trigger = TRIGGERS[n % TRIGGERS.length]!;
      const copy = copies[n]!;
      const offset = Math.round(Math.random() * 40 - 20) + lead[trigger]!;
      const [r, h] = await Promise.all([
        after(offset, () => timed(() => release(copy, n))),
        after(-offset, () => timed(() => contain(trigger, copy, n))),
      ]);
      const seen = took[trigger]!;
      seen.hold += h.ms;
      seen.release += r.ms;
      seen.n += 1;
      lead[trigger] = lead[trigger]! + (r.value.status === 201 ? 5 : -5);
      const rel = r.value;
      const held = h.value;
      expect(held.status, JSON.stringify(held.body)).toBe(201);
      const c = held.body as ContainmentJson;
      const ncrs = c.held.map((h) => h.ncr).filter((v): v is string => v !== null);
      expect(ncrs.length, `pair ${n} (${trigger})`).toBeGreaterThan(0);
      if (rel.status === 201) {
        tally[trigger]!.shipped += 1;
        const [order] = await t.sequelize.query<{ hold_first: boolean }>(
          `SELECT pg_xact_commit_timestamp(c.xmin) < pg_xact_commit_timestamp(s.xmin) AS hold_first
             FROM shipments s, containments c
            WHERE s.reference = :ref AND c.number = :number`,
          { type: QueryTypes.SELECT, replacements: { ref: `CTRACE-${n}`, number: c.number } },
        );
        if (order!.hold_first) {
          tally[trigger]!.wrong += 1;
          wrong.push(`${copy.unit} shipped after containment ${c.number} (by ${trigger}) had committed`);
        }
        // the hold that came second saw the shipment: a field action, not a hold on a shipped part
        expect(
          c.held.every((h) => h.outcome === 'field_action'),
          `pair ${n}: ${JSON.stringify(c.held)}`,
        ).toBe(true);
        expect(c.fieldActions.length).toBeGreaterThan(0);
      } else {
        expect(rel.status, JSON.stringify(rel.body)).toBe(409);
        // refused for an NCR the containment raised, not for anything else
        const messages = (rel.body.error.reasons as { message: string }[]).map((r) => r.message).join(' ');
        expect(
          ncrs.some((number) => messages.includes(number)),
          `pair ${n} (${trigger}): ${messages}`,
        ).toBe(true);
        expect(c.held.every((h) => h.outcome === 'held' || h.outcome === 'already_held')).toBe(true);
        tally[trigger]!.refused += 1;
      }
    }
    const mean = Object.fromEntries(
      TRIGGERS.map((k) => [
        k,
        { holdMs: Math.round(took[k]!.hold / took[k]!.n), releaseMs: Math.round(took[k]!.release / took[k]!.n) },
      ]),
    );
    console.log(
      'containment race:',
      JSON.stringify(tally),
      'mean durations:',
      JSON.stringify(mean),
      'final lead:',
      JSON.stringify(lead),
    );
    expect(wrong).toEqual([]);
    // both orders happened, so the drill raced for real
    const shipped = Object.values(tally).reduce((a, x) => a + x.shipped, 0);
    expect(shipped).toBeGreaterThan(0);
    expect(shipped).toBeLessThan(PAIRS);
  }, 600_000);
});
