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
 * The release gate's promise under races: a unit never ships with an NCR that was already open when
 * its release committed, whatever the NCR is raised on (the unit, a part, a core the parts came
 * from, a lot that went in). Each pair fires a release and a raise at random offsets of −20 to
 * +20 ms; PostgreSQL's own commit timestamps (track_commit_timestamp) judge which committed first.
 *
 * The drill runs in a database of its own: its 200 NCRs and their mail would otherwise land in the
 * shared test database that other files read at the same time.
 */
const PAIRS = 200;
const SUBJECTS = ['unit', 'part', 'core', 'lot'] as const;
type Subject = (typeof SUBJECTS)[number];

let t: TestApp;
let drop: (() => Promise<void>) | undefined;
let cookies: { receiving: string; operator: string };
let shipping: string;
let customerId: number;
let copies: UnitCopy[];

beforeAll(async () => {
  ({ t, drop } = await ownDatabase('release_race'));
  cookies = {
    receiving: await cookieFor(await makeUser('receiving'), t.config),
    operator: await cookieFor(await makeUser('operator'), t.config),
  };
  shipping = await cookieFor(await makeUser('shipping', { quickSignature: true }), t.config);
  customerId = (await Customer.findOne({ order: [['id', 'ASC']] }))!.id;
  await expectCommitTimestamps(t);
  const { unit } = await releasableUnit(t, cookies, 'TARN-6', `RACE${Date.now().toString(36).toUpperCase()}`);
  copies = await cloneUnits(t.sequelize, unit, PAIRS);
}, 180_000);
afterAll(async () => {
  await drop?.();
});

function raise(subject: Subject, copy: UnitCopy, n: number) {
  const what =
    subject === 'unit'
      ? { serial: copy.unit }
      : subject === 'part'
        ? { serial: copy.parts[n % copy.parts.length]!.serial }
        : subject === 'core'
          ? { serial: copy.cores[0]! }
          : { lotCode: copy.lots[n % copy.lots.length]! };
  return request(t.app)
    .post('/api/ncrs')
    .set('Cookie', cookies.operator)
    .send({ ...what, description: 'Seen just before loading', severity: 'major', defectCode: 'DMG' });
}

function release(copy: UnitCopy, n: number) {
  return request(t.app)
    .post(`/api/units/${copy.unit}/release`)
    .set('Cookie', shipping)
    .send({ customerId, reference: `RACE-${n}`, shipDate: plantToday(), password: TEST_PASSWORD });
}

async function after<T>(ms: number, fn: () => PromiseLike<T>): Promise<T> {
  if (ms > 0) await sleep(ms);
  return fn();
}

describe('release against a new NCR, raced', () => {
  it(`when ${PAIRS} releases race NCRs on the unit, a part, a core and a lot, then no unit ships with an NCR open before it shipped`, async () => {
    const tally = Object.fromEntries(SUBJECTS.map((s) => [s, { shipped: 0, refused: 0, wrong: 0 }]));
    const wrong: string[] = [];
    for (let n = 0; n < PAIRS; n++) {
      const subject = SUBJECTS[n % SUBJECTS.length]!;
      const copy = copies[n]!;
      const offset = Math.round(Math.random() * 40 - 20);
      const [rel, ncr] = await Promise.all([
        after(offset, () => release(copy, n)),
        after(-offset, () => raise(subject, copy, n)),
      ]);
      expect(ncr.status, JSON.stringify(ncr.body)).toBe(201);
      if (rel.status === 201) {
        tally[subject]!.shipped += 1;
        // which committed first: the shipment or the NCR (the rows' own transactions)
        const [order] = await t.sequelize.query<{ ncr_first: boolean }>(
          `SELECT pg_xact_commit_timestamp(n.xmin) < pg_xact_commit_timestamp(s.xmin) AS ncr_first
               FROM shipments s, nonconformances n
              WHERE s.reference = :ref AND n.number = :number`,
          { type: QueryTypes.SELECT, replacements: { ref: `RACE-${n}`, number: ncr.body.number } },
        );
        if (order!.ncr_first) {
          tally[subject]!.wrong += 1;
          wrong.push(`${copy.unit} shipped after ${ncr.body.number} (on its ${subject}) was open`);
        }
      } else {
        expect(rel.status, JSON.stringify(rel.body)).toBe(409);
        // refused for the NCR the race raised, not for anything else
        const codes = (rel.body.error.reasons as { code: string; message: string }[]).map((r) => r.message);
        expect(codes.join(' '), `pair ${n} (${subject})`).toContain(ncr.body.number);
        tally[subject]!.refused += 1;
      }
    }
    console.log('release race:', JSON.stringify(tally));
    expect(wrong).toEqual([]);
    // both orders happened, so the drill raced for real
    const shipped = Object.values(tally).reduce((a, x) => a + x.shipped, 0);
    expect(shipped).toBeGreaterThan(0);
    expect(shipped).toBeLessThan(PAIRS);
  }, 600_000);
});
