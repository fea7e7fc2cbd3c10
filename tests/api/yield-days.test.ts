import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { YieldJson } from '../../shared/schemas/line.js';
import { countYieldDays } from '../../server/services/line/yield-days.js';
import { cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';
import { resultFixtures } from '../support/results.js';

/**
 * The yield report sums closed plant days from `yield_days` and judges the rest live. These tests
 * use days of 1990, which no other suite writes results on (a result written with an earlier time
 * forgets the counted days after it, whoever writes it).
 */

let t: TestApp;
let quality: string;
let fx: ReturnType<typeof resultFixtures>;

beforeAll(async () => {
  t = makeTestApp();
  fx = resultFixtures(t.sequelize);
  quality = await cookieFor(await makeUser('quality'), t.config);
});
afterAll(() => t.close());

const report = async (from: string, to: string, family: number) => {
  const res = await request(t.app).get('/api/yields').query({ from, to, family }).set('Cookie', quality);
  expect(res.status).toBe(200);
  return res.body as YieldJson;
};
const stage = (y: YieldJson, code: string) => y.byStage.find((r) => r.stageCode === code);
const at = (day: string, hour = 12) => `${day}T${String(hour).padStart(2, '0')}:00:00Z`;

describe('yields counted by closed plant day', () => {
  it('when the days are counted, then the report sums them, and a correction of a counted day is counted again', async () => {
    const fam = await fx.freshFamily();
    const b = await fx.station('bore-hone');
    const [i1, i2, i3, i4] = [
      await fx.item(fam.id),
      await fx.item(fam.id),
      await fx.item(fam.id),
      await fx.item(fam.id),
    ];
    // hand count (FPY = first-time passes / first-time attempts, common definition): i1 passes;
    // i2 fails then passes (one first attempt, failed); i3 fails; i4 passes → 4 entered, 2 first passes
    await fx.result(i1, 'bore-hone', b.id, 'pass', at('1990-05-02'));
    await fx.result(i2, 'bore-hone', b.id, 'fail', at('1990-05-02', 13));
    await fx.result(i2, 'bore-hone', b.id, 'pass', at('1990-05-03'));
    const slip = await fx.result(i3, 'bore-hone', b.id, 'fail', at('1990-05-04'));
    await fx.result(i4, 'bore-hone', b.id, 'pass', at('1990-05-05'));
    const live = await report('1990-05-01', '1990-05-31', fam.id);
    expect(stage(live, 'bore-hone')).toMatchObject({ entered: 4, firstPass: 2 });

    await countYieldDays(t.sequelize, { from: '1990-05-01', to: '1990-05-31' });
    const countedDays = () =>
      fx.q<{ n: number }>(
        `SELECT count(*)::int AS n FROM yield_days_done WHERE day BETWEEN '1990-05-01' AND '1990-05-31'`,
      );
    // every day from the first result on record (2 May 1990; no suite writes earlier) to 31 May
    expect((await countedDays())[0]!.n).toBe(30);
    const rows = await fx.q<{ day: string; entered: number; first_pass: number }>(
      `SELECT to_char(day, 'YYYY-MM-DD') AS day, entered, first_pass FROM yield_days
        WHERE engine_family_id = :fam ORDER BY day`,
      { fam: fam.id },
    );
    // the same hand count, day by day: 2 May i1 pass + i2 fail; 4 May i3 fail; 5 May i4 pass
    expect(rows).toEqual([
      { day: '1990-05-02', entered: 2, first_pass: 1 },
      { day: '1990-05-04', entered: 1, first_pass: 0 },
      { day: '1990-05-05', entered: 1, first_pass: 1 },
    ]);
    expect(stage(await report('1990-05-01', '1990-05-31', fam.id), 'bore-hone')).toMatchObject({
      entered: 4,
      firstPass: 2,
    });

    // the report reads the counted rows, not the results: a count changed by hand shows (derived data)
    await fx.q(`UPDATE yield_days SET first_pass = 2 WHERE engine_family_id = :fam AND day = '1990-05-02'`, {
      fam: fam.id,
    });
    expect(stage(await report('1990-05-01', '1990-05-31', fam.id), 'bore-hone')).toMatchObject({ firstPass: 3 });

    // i3's failure was a typing slip, corrected today: the correction forgets the days from 3 May
    // (a day early for any time zone) and stands at its own time, outside May; 4–5 May are judged
    // live again → 2 May as counted (2 entered, 2 by hand) + 5 May (i4 passes) = 3 entered, 3 passed
    await fx.result(i3, 'bore-hone', b.id, 'pass', new Date().toISOString(), slip);
    expect((await countedDays())[0]!.n).toBe(1);
    expect(stage(await report('1990-05-01', '1990-05-31', fam.id), 'bore-hone')).toMatchObject({
      entered: 3,
      firstPass: 3,
    });

    // counted again: 3–31 May from the results (4 May has nothing left, i3's failure replaced;
    // 5 May i4 passes), 2 May as it stood
    await countYieldDays(t.sequelize, { from: '1990-05-01', to: '1990-05-31' });
    expect((await countedDays())[0]!.n).toBe(30);
    expect(
      await fx.q(
        `SELECT to_char(day, 'YYYY-MM-DD') AS day, entered, first_pass FROM yield_days
          WHERE engine_family_id = :fam ORDER BY day`,
        { fam: fam.id },
      ),
    ).toEqual([
      { day: '1990-05-02', entered: 2, first_pass: 2 },
      { day: '1990-05-05', entered: 1, first_pass: 1 },
    ]);
    expect(stage(await report('1990-05-01', '1990-05-31', fam.id), 'bore-hone')).toMatchObject({
      entered: 3,
      firstPass: 3,
    });
  });

  it('when a result is recorded with an earlier time, then the days from it on are judged live again', async () => {
    const fam = await fx.freshFamily();
    const b = await fx.station('bore-hone');
    const [i1, i2] = [await fx.item(fam.id), await fx.item(fam.id)];
    await fx.result(i1, 'bore-hone', b.id, 'pass', at('1990-07-10'));
    await countYieldDays(t.sequelize, { from: '1990-07-01', to: '1990-07-31' });
    // a result typed in later for 12 July (a paper record entered after the fact): i2's first attempt
    await fx.result(i2, 'bore-hone', b.id, 'fail', at('1990-07-12'));
    expect(stage(await report('1990-07-01', '1990-07-31', fam.id), 'bore-hone')).toMatchObject({
      entered: 2,
      firstPass: 1,
    });
  });

  it('when the plant changes its time zone, then no day counted in the old zone is used', async () => {
    const days = await fx.q<{ n: number }>(
      `SELECT count(*)::int AS n FROM yield_days_done WHERE time_zone = 'Nowhere/Else'`,
    );
    expect(days[0]!.n).toBe(0);
    const fam = await fx.freshFamily();
    const b = await fx.station('bore-hone');
    const i1 = await fx.item(fam.id);
    await fx.result(i1, 'bore-hone', b.id, 'pass', at('1990-09-10'));
    await countYieldDays(t.sequelize, { from: '1990-09-01', to: '1990-09-30' });
    await fx.q(`UPDATE yield_days SET entered = 9, first_pass = 9 WHERE engine_family_id = :fam`, { fam: fam.id });
    await fx.q(`UPDATE yield_days_done SET time_zone = 'Nowhere/Else' WHERE day BETWEEN '1990-09-01' AND '1990-09-30'`);
    // the zone the days were counted in is not the plant's: judged live, 1 entered, 1 passed
    expect(stage(await report('1990-09-01', '1990-09-30', fam.id), 'bore-hone')).toMatchObject({
      entered: 1,
      firstPass: 1,
    });
  });
});

describe('race drill: counting days against corrections', () => {
  it('when corrections of a counted day race the counter, then every report equals the live judgement', async () => {
    // rule: a day may not stay counted once a correction to it has committed. 40 raced pairs, random
    // offsets; each pair on a day of its own in 1991, the correction entered for that day's
    // afternoon; afterwards every day's report (summed or live) must equal what the hand rule gives:
    // the failure replaced by its correction, a pass → 1 entered, 1 first pass
    const fam = await fx.freshFamily();
    const b = await fx.station('bore-hone');
    const pairs = 40;
    const slips: { day: string; item: number; slip: number }[] = [];
    for (let k = 0; k < pairs; k++) {
      const day = new Date(Date.UTC(1991, 0, 1 + k * 2)).toISOString().slice(0, 10);
      const item = await fx.item(fam.id);
      slips.push({ day, item, slip: await fx.result(item, 'bore-hone', b.id, 'fail', at(day)) });
    }
    // one pair at a time, oldest day first: a correction forgets the counted days from its own
    // on, so a later pair never touches an earlier pair's day
    for (const { day, item, slip } of slips) {
      const jitter = () => new Promise((r) => setTimeout(r, Math.random() * 40));
      await Promise.all([
        jitter().then(() => countYieldDays(t.sequelize, { from: day, to: day })),
        jitter().then(() =>
          // as the station writes one: the result, then its readings and audit before the commit
          t.sequelize.transaction(async (tx) => {
            await fx.result(item, 'bore-hone', b.id, 'pass', at(day, 15), slip, tx);
            await fx.q('SELECT pg_sleep(:s)', { s: Math.random() * 0.05 }, tx);
          }),
        ),
      ]);
    }
    // a last count settles whatever was forgotten; the report must hold before and after it
    for (const pass of ['raced', 'counted again']) {
      if (pass === 'counted again') await countYieldDays(t.sequelize, { from: '1991-01-01', to: '1991-03-31' });
      for (const { day } of slips) {
        expect(stage(await report(day, day, fam.id), 'bore-hone'), `${day}, ${pass}`).toMatchObject({
          entered: 1,
          firstPass: 1,
        });
      }
    }
  }, 120_000);
});
