import { setTimeout as sleep } from 'node:timers/promises';
import request from 'supertest';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PartLot } from '../../server/models/index.js';
import { cookieFor, makeTestApp, makeUser, unique, type TestApp } from '../support/app.js';
import { finishedParts, lotsFor } from '../support/parts.js';

/**
 * A lot on hold cannot be drawn, and a lot cannot give more than came in, under races. Each pair
 * fires a build and a hold of one of its lots at a random offset (the hold up to a build's time
 * before it, or up to one and a half builds' time after); PostgreSQL's own commit timestamps (track_commit_timestamp) judge which committed
 * first: a build that drew from the lot must have committed before the hold did. Then builds race for a lot's last parts.
 * Each build needs parts that finished their routes through the API, so the pairs are fewer than
 * the release drill's hundreds of cloned units.
 */
const PAIRS = 10;
const RACERS = 4;

let t: TestApp;
let cookies: { receiving: string; operator: string };
let quality: string;

beforeAll(async () => {
  t = makeTestApp();
  cookies = {
    receiving: await cookieFor(await makeUser('receiving'), t.config),
    operator: await cookieFor(await makeUser('operator'), t.config),
  };
  quality = await cookieFor(await makeUser('quality'), t.config);
});
afterAll(() => t.close());

async function after<T>(ms: number, fn: () => PromiseLike<T>): Promise<T> {
  if (ms > 0) await sleep(ms);
  return fn();
}

type Lots = Awaited<ReturnType<typeof lotsFor>>;
const build = (parts: Awaited<ReturnType<typeof finishedParts>>, lots: Lots) =>
  request(t.app).post('/api/units').set('Cookie', cookies.operator).send({
    family: 'TARN-6',
    block: parts.block,
    crankshaft: parts.crankshaft,
    heads: parts.heads,
    lots,
  });

describe('drawing from a lot, raced', () => {
  it(`when ${PAIRS} builds race a hold of their rings lot, then no build draws from a lot whose hold committed first`, async () => {
    const tally = { built: 0, refused: 0, wrong: [] as string[] };
    // a build does much before it reaches the lots: time one, and fire each hold somewhere between
    // with the build and well after it would have finished, so both orders happen
    const warm = await finishedParts(t, cookies, 'TARN-6');
    const started = performance.now();
    expect((await build(warm, await lotsFor(0.0197, `HW${unique('').slice(0, 6).toUpperCase()}`))).status).toBe(201);
    const span = performance.now() - started;
    for (let n = 0; n < PAIRS; n++) {
      const tag = `HR${unique('').slice(0, 6).toUpperCase()}`;
      const lots = await lotsFor(0.0197, tag);
      const rings = lots.find((l) => l.kind === 'rings')!;
      const lot = (await PartLot.findOne({ where: { lotCode: rings.lotCode, partNumber: rings.partNumber } }))!;
      const parts = await finishedParts(t, cookies, 'TARN-6');
      // a random offset either way: the hold fired up to a build's time before the build, or after it
      // by up to one and a half builds' time (a first build timed cold can make the span long)
      const offset = Math.round((Math.random() * 2.5 - 1) * span);
      const [built, hold] = await Promise.all([
        after(-offset, () => build(parts, lots)),
        after(offset, () =>
          request(t.app)
            .post(`/api/receiving/lots/${lot.id}/inspection`)
            .set('Cookie', quality)
            .send({ inspection: 'on_hold', reason: `Race drill pair ${n}` }),
        ),
      ]);
      expect(hold.status, JSON.stringify(hold.body)).toBe(200);
      if (built.status === 201) {
        tally.built += 1;
        const [order] = await t.sequelize.query<{ hold_first: boolean }>(
          `SELECT pg_xact_commit_timestamp(a.xmin) < pg_xact_commit_timestamp(i.xmin) AS hold_first
             FROM audit_events a, items i
            WHERE a.entity = 'part_lot' AND a.entity_id = :lot AND a.action = 'lot.inspected' AND i.serial = :unit`,
          { type: QueryTypes.SELECT, replacements: { lot: String(lot.id), unit: built.body.serial } },
        );
        if (order!.hold_first) tally.wrong.push(`${built.body.serial} drew from lot ${lot.lotCode} after its hold`);
      } else {
        expect(built.status, JSON.stringify(built.body)).toBe(409);
        // refused for the hold the race made, and for nothing else
        expect(Object.values(built.body.error.fields as Record<string, string>)).toEqual([
          `Lot ${lot.lotCode} (part number ${lot.partNumber}) is on hold at receiving: Race drill pair ${n} Use another lot.`,
        ]);
        tally.refused += 1;
      }
    }
    console.log('hold-vs-build race:', JSON.stringify({ built: tally.built, refused: tally.refused, span }));
    expect(tally.wrong).toEqual([]);
    expect(tally.built + tally.refused).toBe(PAIRS);
    // both orders happened, so the drill raced for real
    expect(tally.built).toBeGreaterThan(0);
    expect(tally.refused).toBeGreaterThan(0);
  }, 600_000);

  it(`when ${RACERS} builds race for a lot with 2 parts left, then exactly 2 draw and the lot is never overdrawn`, async () => {
    const tag = `OD${unique('').slice(0, 6).toUpperCase()}`;
    const lots = await lotsFor(0.0197, tag);
    const timing = lots.find((l) => l.kind === 'timing_set')!;
    const lot = (await PartLot.findOne({ where: { lotCode: timing.lotCode, partNumber: timing.partNumber } }))!;
    await lot.update({ quantityReceived: 2 }); // the factory's 1000 cut down to the last two
    const sets = [];
    for (let i = 0; i < RACERS; i++) sets.push(await finishedParts(t, cookies, 'TARN-6'));
    const replies = await Promise.all(
      sets.map((parts, i) =>
        after(Math.round(Math.random() * 20), () => build(parts, lots)).then((r) => [i, r] as const),
      ),
    );
    const built = replies.filter(([, r]) => r.status === 201);
    const refused = replies.filter(([, r]) => r.status !== 201);
    expect(built).toHaveLength(2);
    for (const [, r] of refused) {
      expect(r.status).toBe(409);
      expect(Object.values(r.body.error.fields as Record<string, string>).join(' ')).toMatch(
        /has none left: all 2 received have been used/,
      );
    }
    await lot.reload();
    expect({ received: lot.quantityReceived, drawn: lot.quantityDrawn }).toEqual({ received: 2, drawn: 2 });
    const [{ n }] = (await t.sequelize.query<{ n: number }>(
      'SELECT coalesce(sum(quantity), 0)::int AS n FROM unit_lots WHERE part_lot_id = :id',
      { type: QueryTypes.SELECT, replacements: { id: lot.id } },
    )) as [{ n: number }];
    expect(n).toBe(2);
  }, 600_000);
});
