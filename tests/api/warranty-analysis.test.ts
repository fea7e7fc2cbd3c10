import { addDays, format, parseISO } from 'date-fns';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { medianRankRegression } from '../../shared/domain/weibull.js';
import { weibullMle } from '../../shared/domain/weibull-mle.js';
import { DAYS_PER_MONTH, type AnalysisJson, type WeibullJson } from '../../shared/schemas/warranty.js';
import { TEST_PASSWORD, makeTestApp, type TestApp } from '../support/app.js';
import {
  claimPeople,
  get,
  post,
  returnedClaim,
  shippedOn,
  shippedUnits,
  type ClaimPeople,
} from '../support/warranty.js';

/**
 * Claim rates and the Weibull analysis through the API, on a fleet of five units of this test's own
 * (shipped, as a fixture, on 1 March of a year between 1950 and 1994 that no other test ships in,
 * and read back with that date range). The five are weibull.com Reliability HotWire 104's example turned into days in
 * service: suspended at 250, failed at 273 and 390, suspended at 410, failed at 500. The article's
 * times are hours; the ranks depend only on the order, so Johnson's adjusted ranks must be 1.2, 2.4
 * and 4.2, as recomputed by hand in tests/unit/weibull.test.ts.
 */

let t: TestApp;
let people: ClaimPeople;
// a year of this run's own, so a database the suite ran in before does not add to the fleet
const YEAR = 1950 + Math.floor(Math.random() * 45);
const SHIPPED = `${YEAR}-03-01`;
const RANGE = `from=${YEAR}-01-01&to=${YEAR}-12-31`;
const DAYS = [
  { days: 250, failed: false },
  { days: 273, failed: true },
  { days: 390, failed: true },
  { days: 410, failed: false },
  { days: 500, failed: true },
];
let failureCause: string;

beforeAll(async () => {
  t = makeTestApp();
  people = await claimPeople(t);
  failureCause = `BRG${Date.now().toString(36).slice(-5).toUpperCase()}`;
  const cause = await post(t, people.quality.cookie, '/api/warranty/cause-codes', {
    code: failureCause,
    description: 'Main bearing spun (machining of the line bore)',
    countsAsFailure: true,
  });
  if (cause.status !== 201) throw new Error(JSON.stringify(cause.body));
  const units = await shippedUnits(t, people, DAYS.length);
  for (const [i, d] of DAYS.entries()) {
    const copy = units[i]!;
    await shippedOn(t, copy.unit, SHIPPED);
    const failedOn = format(addDays(parseISO(SHIPPED), d.days), 'yyyy-MM-dd');
    const number = await returnedClaim(t, people, copy.unit, { failedOn });
    const block = copy.parts.find((p) => p.kind === 'block')!.serial;
    const res = await post(t, people.operator.cookie, `/api/warranty/claims/${number}/teardown`, {
      findings: [
        d.failed
          ? { part: block, causeCode: failureCause, description: 'Number 3 main bearing spun, line bore oval' }
          : { part: copy.unit, causeCode: 'NTF', description: 'Ran clean on the test stand' },
      ],
      password: TEST_PASSWORD,
    });
    if (res.status !== 200) throw new Error(JSON.stringify(res.body));
  }
}, 300_000);
afterAll(() => t.close());

describe('the Weibull analysis counts every unit', () => {
  it('when three of five failed, then Johnson’s ranks are 1.2, 2.4 and 4.2 and the fits are those of the same records', async () => {
    const res = await get(t, people.desk.cookie, `/api/warranty/weibull?${RANGE}`);
    expect(res.status).toBe(200);
    const w = res.body as WeibullJson;
    expect(w).toMatchObject({
      units: 5,
      failures: 3,
      suspensions: 2,
      notInService: 0,
      message: null,
      unitOfTime: 'months',
    });
    // HotWire 104, recomputed: 6/5 = 1.2; (3 × 1.2 + 6)/4 = 2.4; (1 × 2.4 + 6)/2 = 4.2
    expect(w.points.map((p) => p.adjustedRank)).toEqual([1.2, 2.4, 4.2].map((r) => expect.closeTo(r, 12)));
    // Bernard: (j − 0.3)/(n + 0.4)
    expect(w.points.map((p) => p.medianRank)).toEqual(
      [0.9 / 5.4, 2.1 / 5.4, 3.9 / 5.4].map((f) => expect.closeTo(f, 12)),
    );
    expect(w.points.map((p) => p.time)).toEqual([273, 390, 500].map((d) => expect.closeTo(d / DAYS_PER_MONTH, 12)));
    // the same records handed to the library (itself held to R in tests/unit): the route adds nothing of its own
    const records = DAYS.map((d) => ({ time: d.days / DAYS_PER_MONTH, failed: d.failed }));
    const mrr = medianRankRegression(records);
    const mle = weibullMle(records);
    expect(w.regression!.shape).toBeCloseTo(mrr.shape, 10);
    expect(w.regression!.scale).toBeCloseTo(mrr.scale, 10);
    expect(w.regression!.rSquared).toBeCloseTo(mrr.rSquared, 10);
    expect(w.mle!.shape).toBeCloseTo(mle.shape, 10);
    expect(w.mle!.scale).toBeCloseTo(mle.scale, 10);
    // B10 = η (−ln 0.9)^(1/β), the definition of the 10 % life
    expect(w.mle!.b10).toBeCloseTo(mle.scale * (-Math.log(0.9)) ** (1 / mle.shape), 10);
    expect(w.regression!.line.length).toBe(61);
  });

  it('when no unit in the range has been in service, then the reply says so in words, not an error', async () => {
    const res = await get(t, people.quality.cookie, '/api/warranty/weibull?from=1990-01-01&to=1990-01-31');
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({
      units: 0,
      failures: 0,
      regression: null,
      mle: null,
      message: 'No unit has been in service yet.',
    });
  });
});

describe('claim rates', () => {
  it('when the fleet is read by family, station and months in service, then each group counts its units, claims and failures', async () => {
    const res = await get(t, people.desk.cookie, `/api/warranty/analysis?${RANGE}`);
    expect(res.status).toBe(200);
    const a = res.body as AnalysisJson;
    expect(a.fleet).toEqual({ units: 5, claims: 5, failures: 3 });
    expect(a.rates.family).toEqual([
      expect.objectContaining({ key: 'TARN-6', units: 5, claims: 5, failures: 3, claimRate: 100, failureRate: 60 }),
    ]);
    // the block was bored and honed at BH-1 on every unit; the failures' findings name the block
    expect(a.rates.station.find((r) => r.key === 'BH-1')).toMatchObject({
      units: 5,
      claims: 3,
      failures: 3,
      failureRate: 60,
    });
    // the no-trouble-found findings name the unit itself, assembled at AS-1
    expect(a.rates.station.find((r) => r.key === 'AS-1')).toMatchObject({ units: 5, claims: 2, failures: 0 });
    expect(a.rates.coreSource).toEqual([expect.objectContaining({ label: 'Customer return', units: 5, claims: 5 })]);
    expect(a.rates.lot.length).toBeGreaterThan(0);
    expect(a.rates.gauge.every((r) => r.units === 5)).toBe(true);
    // months in service: ⌊days / 30.4375⌋ — 250 → 8, 273 → 8, 390 → 12, 410 → 13, 500 → 16
    const month = (m: number) => a.monthsInService[m]!;
    expect(month(8)).toMatchObject({ claims: 2, failures: 1, atRisk: 5 });
    expect(month(12)).toMatchObject({ claims: 1, failures: 1 });
    expect(month(13)).toMatchObject({ claims: 1, failures: 0 });
    expect(month(16)).toMatchObject({ claims: 1, failures: 1 });
    expect(a.monthsInService.reduce((s, m) => s + m.claims, 0)).toBe(5);
  });

  it('when the rates are exported, then the CSV has one row per group with the same figures', async () => {
    const res = await get(t, people.desk.cookie, `/api/warranty/analysis.csv?${RANGE}`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    const lines = res.text.trim().split('\r\n');
    // every export starts with the UTF-8 byte-order mark (shared/csv.ts); trim() above drops it
    expect(res.text.startsWith('\ufeffdimension,')).toBe(true);
    expect(lines[0]).toBe('dimension,group,units_shipped,claims,failures,claims_per_100,failures_per_100');
    expect(lines).toContain('Engine family,TARN-6 — Tarn inline six,5,5,3,100,60');
  });

  it('when the query is bad or the role may not read it, then 4xx', async () => {
    for (const q of ['family=abc', 'from=2001-13-01', 'to=yesterday', 'groupBy=lot']) {
      const res = await get(t, people.desk.cookie, `/api/warranty/analysis?${q}`);
      expect(res.status, q).toBe(400);
    }
    expect((await get(t, people.operator.cookie, '/api/warranty/analysis')).status).toBe(403);
    expect((await get(t, people.shipping.cookie, '/api/warranty/weibull')).status).toBe(403);
  });
});

describe('cause codes', () => {
  it('when quality adds, rewords and retires a cause, then a retired one can no longer be used and bad input is refused', async () => {
    const code = `X${Date.now().toString(36).slice(-6).toUpperCase()}`;
    expect(
      (
        await post(t, people.desk.cookie, '/api/warranty/cause-codes', {
          code,
          description: 'Nope',
          countsAsFailure: true,
        })
      ).status,
    ).toBe(403);
    expect(
      (
        await post(t, people.quality.cookie, '/api/warranty/cause-codes', {
          code: 'a b',
          description: 'Bad code',
          countsAsFailure: true,
        })
      ).status,
    ).toBe(400);
    expect(
      (
        await post(t, people.quality.cookie, '/api/warranty/cause-codes', {
          code,
          description: 'Timing chain guide',
          countsAsFailure: 'yes',
        })
      ).status,
    ).toBe(400);
    expect(
      (
        await post(t, people.quality.cookie, '/api/warranty/cause-codes', {
          code,
          description: 'Timing chain guide',
          countsAsFailure: true,
        })
      ).status,
    ).toBe(201);
    expect(
      (
        await post(t, people.quality.cookie, '/api/warranty/cause-codes', {
          code,
          description: 'Twice',
          countsAsFailure: true,
        })
      ).status,
    ).toBe(409);
    const patched = await request(t.app)
      .patch(`/api/warranty/cause-codes/${code}`)
      .set('Cookie', people.quality.cookie)
      .send({ active: false });
    expect(patched.status).toBe(200);
    expect(patched.body).toMatchObject({ code, active: false, countsAsFailure: true });
    const list = await get(t, people.operator.cookie, '/api/warranty/cause-codes');
    expect(list.body.find((c: { code: string }) => c.code === 'NTF')).toMatchObject({
      countsAsFailure: false,
      active: true,
    });
    expect(list.body.find((c: { code: string }) => c.code === 'INSTALL')).toMatchObject({ countsAsFailure: false });
  });
});
