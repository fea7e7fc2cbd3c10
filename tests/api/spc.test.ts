import { randomUUID } from 'node:crypto';
import jStat from 'jstat';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nominalSizeClasses, passingReadings } from '../../db/seeders/sample-readings.js';
import {
  AuditEvent,
  Characteristic,
  Customer,
  Item,
  MailOutbox,
  Nonconformance,
  RuleRehearsal,
  SpcLimits,
  SpcSignal,
  Stage,
} from '../../server/models/index.js';
import { cookieFor, makeTestApp, makeUser, TEST_PASSWORD, unique, type TestApp } from '../support/app.js';
import {
  CRANK_STATIONS,
  formFor,
  gaugesOf,
  HEAD_STATIONS,
  lotsFor,
  passThrough,
  plantToday,
  tornDownCore,
} from '../support/parts.js';

/**
 * SPC through the API, on results recorded at a bore-and-hone station of this file's own, so
 * nothing another test records at the same time reaches these charts, limits or rehearsals.
 * CORRIE-8 cylinder bores: 8 cylinders × 3 depths × 2 axes = 48 readings a block, 4.0300 ± 0.0005 in
 * (the demo spec book, db/seeders/spec-book.ts).
 */

let t: TestApp;
let cookies: { receiving: string; operator: string };
let quality: string;
let quality2: string;
let supervisor: string;
let supervisorId: number;
let stationId: number;
let operatorOnly: string;
let station: string;
let boreId: number;
const started = new Date(Date.now() - 60_000).toISOString();
let fixtureEnd: string;
let shippedBlock: string;
let shippedUnit: string;

/**
 * The fixture, in 1e-4 in: each block's thrust readings at a, its axial readings at b, so its mean
 * is (a + b)/2 and its within-part s is |a − b|/2 · √(48/47) (24 readings at each of two values).
 */
const FIXTURE: [number, number][] = [
  [4.03, 4.0301],
  [4.03, 4.03],
  [4.03, 4.0301],
  [4.0299, 4.03],
  [4.03, 4.0301],
  [4.03, 4.03],
];

const q = (path: string, cookie: string, query: Record<string, string | number | undefined>) =>
  request(t.app).get(path).set('Cookie', cookie).query(query);

/** A CORRIE-8 block torn down and passed up to bore and hone. */
async function blockAtBoreHone() {
  const parts = await tornDownCore(t, cookies, 'CORRIE-8');
  await passThrough(t, cookies.operator, ['CLN-1', 'MPI-1', 'PT-1', 'LH-1'], parts.block);
  return parts;
}

/** Records bore and hone at this file's station: thrust readings a, axial readings b. */
async function recordBores(serial: string, a: number, b: number) {
  const form = await formFor(t, cookies.operator, station, serial);
  const res = await request(t.app)
    .post('/api/results')
    .set('Cookie', cookies.operator)
    .send({
      idempotencyKey: randomUUID(),
      serial,
      station,
      ...gaugesOf(form),
      readings: passingReadings(form, (c, p, v) => (c === 'bore' ? (p.endsWith('/thrust') ? a : b) : v)),
      sizeClasses: nominalSizeClasses(form),
    });
  if (res.status !== 201) throw new Error(`result failed: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body as { id: number; verdict: string; item: { status: string } };
}

beforeAll(async () => {
  t = makeTestApp();
  cookies = {
    receiving: await cookieFor(await makeUser('receiving'), t.config),
    operator: await cookieFor(await makeUser('operator'), t.config),
  };
  quality = await cookieFor(await makeUser('quality'), t.config);
  quality2 = await cookieFor(await makeUser('quality', { name: 'Second Quality' }), t.config);
  const sup = await makeUser('supervisor');
  supervisorId = sup.id;
  supervisor = await cookieFor(sup, t.config);
  operatorOnly = cookies.operator;
  const admin = await cookieFor(await makeUser('admin'), t.config);
  station = unique('BH').toUpperCase().slice(0, 12);
  const made = await request(t.app)
    .post('/api/stations')
    .set('Cookie', admin)
    .send({ code: station, name: `Bore and hone ${station}`, stageCode: 'bore-hone' });
  if (made.status !== 201) throw new Error(JSON.stringify(made.body));
  stationId = made.body.id;
  const stage = (await Stage.findOne({ where: { code: 'bore-hone' } }))!;
  boreId = (await Characteristic.findOne({ where: { stageId: stage.id, code: 'bore' } }))!.id;

  for (const [a, b] of FIXTURE) {
    const { block } = await blockAtBoreHone();
    await recordBores(block, a, b);
  }
  fixtureEnd = new Date().toISOString();

  // a block read at 4.0304 in (in tolerance), built into a unit that ships
  const parts = await blockAtBoreHone();
  await recordBores(parts.block, 4.0304, 4.0304);
  await passThrough(t, cookies.operator, ['DK-1', 'WSH-1'], parts.block);
  await passThrough(t, cookies.operator, CRANK_STATIONS, parts.crankshaft);
  for (const h of parts.heads) await passThrough(t, cookies.operator, HEAD_STATIONS, h);
  const built = await request(t.app)
    .post('/api/units')
    .set('Cookie', cookies.operator)
    .send({
      family: 'CORRIE-8',
      block: parts.block,
      crankshaft: parts.crankshaft,
      heads: parts.heads,
      lots: await lotsFor(0.03, unique('SPC').toUpperCase()),
    });
  if (built.status !== 201) throw new Error(JSON.stringify(built.body));
  shippedUnit = built.body.serial;
  shippedBlock = parts.block;
  await passThrough(t, cookies.operator, ['AS-1', 'RT-1', 'FI-1'], shippedUnit);
  const shipping = await cookieFor(await makeUser('shipping'), t.config);
  const customer = (await Customer.findOne())!;
  const released = await request(t.app)
    .post(`/api/units/${shippedUnit}/release`)
    .set('Cookie', shipping)
    .send({ customerId: customer.id, reference: unique('SO-'), shipDate: plantToday(), password: TEST_PASSWORD });
  if (released.status !== 201) throw new Error(JSON.stringify(released.body));
}, 300_000);
afterAll(() => t.close());

describe('the control chart of a characteristic', () => {
  it('when six blocks are charted, then the part means, moving ranges, within-part s and limits are the hand-computed ones', async () => {
    const res = await q('/api/spc/chart', quality, {
      family: 'CORRIE-8',
      characteristicId: boreId,
      from: started,
      to: fixtureEnd,
      station,
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const c = res.body;
    expect(c.method).toBe('part-means');
    expect(c.subgroupSize).toBe(48);
    expect(c.points).toHaveLength(6);
    expect(c.readings).toBe(288);
    const [means, mr, within] = c.charts;
    // means (a + b)/2: 4.03005, 4.03, 4.03005, 4.02995, 4.03005, 4.03 (by hand)
    const expected = [4.03005, 4.03, 4.03005, 4.02995, 4.03005, 4.03];
    means.values.forEach((v: number, i: number) => expect(v).toBeCloseTo(expected[i]!, 9));
    // x̄ = 4.03 + (5 + 0 + 5 − 5 + 5 + 0)·1e-5/6 = 4.0300166667 (by hand)
    expect(means.centre).toBeCloseTo(4.0300166667, 9);
    // moving ranges 5, 5, 10, 10, 5 (1e-5 in) → MR̄ = 7e-5; the first point has none (by hand)
    expect(mr.values[0]).toBeNull();
    expect(mr.values.slice(1).map((v: number) => Math.round(v * 1e5))).toEqual([5, 5, 10, 10, 5]);
    expect(mr.centre).toBeCloseTo(7e-5, 12);
    // limits x̄ ± 3·MR̄/d2, d2(2) = 1.128 (NIST/SEMATECH e-Handbook §6.3.2.2; ASTM E2587)
    expect(means.upper).toBeCloseTo(4.0300166667 + (3 * 7e-5) / 1.128, 9);
    expect(means.lower).toBeCloseTo(4.0300166667 - (3 * 7e-5) / 1.128, 9);
    // MR chart upper limit D4(2)·MR̄ = 3.267 × 7e-5 (e-Handbook §6.3.2.2)
    expect(mr.upper).toBeCloseTo(3.267 * 7e-5, 10);
    // within-part s: 0.5e-4·√(48/47) for the four blocks whose axes differ, 0 for the others (by hand)
    const s1 = 0.5e-4 * Math.sqrt(48 / 47);
    expect(within.kind).toBe('within-s');
    within.values.forEach((v: number, i: number) => expect(v).toBeCloseTo([s1, 0, s1, s1, s1, 0][i]!, 12));
    expect(within.centre).toBeCloseTo((4 * s1) / 6, 12);
    // B4 = 1 + 3√(1 − c4²)/c4 with c4(48) from jStat's ln Γ (e-Handbook §6.3.2.1; jstat, an independent library)
    const c4 = Math.sqrt(2 / 47) * Math.exp(jStat.gammaln(24) - jStat.gammaln(23.5));
    expect(within.upper).toBeCloseTo(((4 * s1) / 6) * (1 + (3 * Math.sqrt(1 - c4 * c4)) / c4), 12);
    // the spec is the rule in force, 4.0300 ± 0.0005 (demo spec book)
    expect(c.spec).toMatchObject({ lower: 4.0295, upper: 4.0305 });
    expect(c.capability.n).toBe(288);
    expect(c.capability.mean).toBeCloseTo(4.0300166667, 9);
    // σ of one reading = √(σ²means + σ²within·(1 − 1/n)), σmeans = MR̄/1.128, σwithin = s̄/c4 (docs/statistics.md)
    const sigma = Math.sqrt((7e-5 / 1.128) ** 2 + ((4 * s1) / 6 / c4) ** 2 * (1 - 1 / 48));
    expect(c.capability.within.sigma).toBeCloseTo(sigma, 12);
    // Cpk = min(USL − μ, μ − LSL)/3σ (e-Handbook §6.1.6)
    expect(c.capability.within.index).toBeCloseTo((4.0305 - 4.0300166667) / (3 * sigma), 6);
    // the means and their moving ranges stay inside their limits; the within-part chart flags every
    // block: s1 is above B4·s̄ ≈ 0.87·s1 and 0 is below B3·s̄ ≈ 0.46·s1 (rule 1, by hand)
    const b3 = 1 - (3 * Math.sqrt(1 - c4 * c4)) / c4;
    expect(within.lower).toBeCloseTo(((4 * s1) / 6) * b3, 12);
    expect(c.signals.filter((x: { chart: string }) => x.chart !== 'within-s')).toEqual([]);
    expect(c.signals.map((x: { index: number; rule: number }) => [x.index, x.rule])).toEqual(
      [0, 1, 2, 3, 4, 5].map((i) => [i, 1]),
    );
    expect(c.histogram.bins.reduce((n: number, b: { count: number }) => n + b.count, 0)).toBe(288);
  });

  it('when capability is asked by station and gauge, then the first row is every result and the counts match the chart', async () => {
    const res = await q('/api/spc/capability', supervisor, {
      family: 'CORRIE-8',
      characteristicId: boreId,
      from: started,
      to: fixtureEnd,
      station,
    });
    expect(res.status).toBe(200);
    expect(res.body.rows[0]).toMatchObject({ station, parts: 6, readings: 288 });
    expect(res.body.rows[0].mean).toBeCloseTo(4.0300166667, 9);
  });

  it('when one reading per part is charted as individuals, then a multi-position characteristic is refused with 400', async () => {
    const res = await q('/api/spc/chart', quality, {
      family: 'CORRIE-8',
      characteristicId: boreId,
      from: started,
      to: fixtureEnd,
      station,
      chart: 'i-mr',
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.chart).toBeTruthy();
  });
});

describe('frozen limits and signals at the station', () => {
  it('when an operator or a supervisor tries to freeze limits, then 403 and nothing is written', async () => {
    const body = {
      family: 'CORRIE-8',
      characteristicId: boreId,
      station,
      baselineFrom: started,
      baselineTo: fixtureEnd,
      reason: 'Not mine to freeze',
    };
    for (const cookie of [operatorOnly, supervisor]) {
      const res = await request(t.app).post('/api/spc/limits').set('Cookie', cookie).send(body);
      expect(res.status).toBe(403);
    }
    expect(await SpcLimits.count({ where: { characteristicId: boreId, reason: 'Not mine to freeze' } })).toBe(0);
  });

  it('when quality freezes limits from the fixture, then they are the baseline statistics, audited in the same transaction, and a second freeze supersedes the first', async () => {
    const body = {
      family: 'CORRIE-8',
      characteristicId: boreId,
      station,
      baselineFrom: started,
      baselineTo: fixtureEnd,
      reason: 'Six blocks after the hone was set up',
      holdOnSignal: false,
    };
    const first = await request(t.app).post('/api/spc/limits').set('Cookie', quality).send(body);
    expect(first.status, JSON.stringify(first.body)).toBe(201);
    expect(first.body).toMatchObject({ station, method: 'part-means', baselinePoints: 6, holdOnSignal: false });
    expect(first.body.limits).toMatchObject({ method: 'part-means', n: 48, within: 's' });
    expect(first.body.limits.mrBar).toBeCloseTo(7e-5, 12);
    const audit = await AuditEvent.findOne({ where: { action: 'spc.limits_frozen', entityId: String(first.body.id) } });
    expect(audit?.after).toMatchObject({ station, baselinePoints: 6, reason: body.reason });

    const second = await request(t.app)
      .post('/api/spc/limits')
      .set('Cookie', quality)
      .send({ ...body, reason: 'Same baseline, now holding parts on a signal', holdOnSignal: true });
    expect(second.status).toBe(201);
    const old = (await SpcLimits.findByPk(first.body.id))!;
    expect(old.supersededById).toBe(second.body.id);
    expect(
      await AuditEvent.count({ where: { action: 'spc.limits_superseded', entityId: String(first.body.id) } }),
    ).toBe(1);
    // never edited, even from SQL: only the supersession is set, once
    await expect(
      t.sequelize.query('UPDATE spc_limits SET reason = :r WHERE id = :id', {
        replacements: { r: 'rewritten', id: second.body.id },
      }),
    ).rejects.toThrow(/never edited/);
    await expect(
      t.sequelize.query('DELETE FROM spc_limits WHERE id = :id', { replacements: { id: first.body.id } }),
    ).rejects.toThrow(/never deleted/);
    const list = await q('/api/spc/limits', supervisor, { family: 'CORRIE-8', characteristicId: boreId });
    expect(list.body.find((l: { id: number }) => l.id === first.body.id)).toMatchObject({
      supersededAt: expect.any(String),
    });
  });

  it('when a block reads high at the station, then the run-rule signal is stored, quality is mailed and the part is held, in the result’s transaction', async () => {
    const { block } = await blockAtBoreHone();
    const result = await recordBores(block, 4.0304, 4.0304);
    // 4.0304 in is inside 4.0300 ± 0.0005: the result passes, the chart does not
    expect(result.verdict).toBe('pass');
    expect(result.item.status).toBe('on_hold');
    const item = (await Item.findOne({ where: { serial: block } }))!;
    const signals = await SpcSignal.findAll({ where: { stageResultId: result.id } });
    // the part mean 4.0304 is above x̄ + 3·MR̄/1.128 ≈ 4.03020 (rule 1, Western Electric)
    expect(signals.map((s) => [s.chart, s.rule])).toContainEqual(['part-mean', 1]);
    const mean = signals.find((s) => s.chart === 'part-mean')!;
    expect(mean.value).toBeCloseTo(4.0304, 9);
    expect(mean.upperLimit).toBeCloseTo(4.0300166667 + (3 * 7e-5) / 1.128, 9);
    const ncr = (await Nonconformance.findByPk(mean.nonconformanceId!))!;
    expect(ncr).toMatchObject({ itemId: item.id, state: 'raised', itemStatusBefore: 'in_process' });
    expect(ncr.description).toContain('one point beyond a control limit');
    const mail = await MailOutbox.findAll({
      where: { reason: 'spc.signal', subject: `Control chart signal: Cylinder bore diameter on ${block}` },
    });
    expect(mail.length).toBeGreaterThan(0);
    expect(await AuditEvent.count({ where: { action: 'spc.signal_raised', entityId: String(result.id) } })).toBe(1);

    const listed = await q('/api/spc/signals', supervisor, { family: 'CORRIE-8', characteristicId: boreId });
    expect(
      listed.body.filter((s: { serial: string }) => s.serial === block).map((s: { ncr: string }) => s.ncr),
    ).toContain(ncr.number);
    // held already: a second hold of the same signal is refused, and no second NCR is raised
    const again = await request(t.app)
      .post(`/api/spc/signals/${mean.id}/hold`)
      .set('Cookie', supervisor)
      .send({ reason: 'Hold it again please' });
    expect(again.status).toBe(409);
    expect(await Nonconformance.count({ where: { itemId: item.id } })).toBe(1);
  });
});

describe('rehearsing a draft rule', () => {
  it('when a tighter draft is rehearsed, then the flips match a hand-written SQL count and the shipped unit is named', async () => {
    const draft = await request(t.app)
      .post('/api/spec/rules')
      .set('Cookie', quality)
      .send({
        family: 'CORRIE-8',
        characteristicId: boreId,
        limits: { limitType: 'nominal', nominal: 4.03, minusTol: 0.0003, plusTol: 0.0003, resolution: 0.0001 },
      });
    expect(draft.status, JSON.stringify(draft.body)).toBe(201);
    const id = draft.body.id as number;
    try {
      const to = new Date(Date.now() + 60_000).toISOString();
      const res = await request(t.app)
        .post(`/api/spec/rules/${id}/rehearsals`)
        .set('Cookie', quality)
        .send({ from: started, to, station });
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      const s = res.body.summary;

      // the same question in SQL alone: parts (newest result at this station) with a passing bore
      // reading outside 4.0297–4.0303 in, and those without one that failed
      const [hand] = await t.sequelize.query<{ p2f: number; f2p: number; parts: number; shipped: number }>(
        `WITH last AS (
           SELECT DISTINCT ON (sr.item_id) sr.id, sr.item_id FROM stage_results sr
            WHERE sr.station_id = (SELECT id FROM stations WHERE code = :station)
              AND NOT EXISTS (SELECT 1 FROM stage_results x WHERE x.supersedes_id = sr.id)
            ORDER BY sr.item_id, sr.finished_at DESC, sr.id DESC),
         judged AS (
           SELECT l.item_id, bool_or(r.verdict = 'fail') AS was_fail,
                  bool_or(r.value < 4.0297 OR r.value > 4.0303) AS now_fail
             FROM last l JOIN readings r ON r.stage_result_id = l.id AND r.characteristic_id = :bore
            GROUP BY l.item_id)
         SELECT count(*) FILTER (WHERE NOT was_fail AND now_fail)::int AS p2f,
                count(*) FILTER (WHERE was_fail AND NOT now_fail)::int AS f2p, count(*)::int AS parts,
                (SELECT count(DISTINCT s.unit_item_id)::int FROM judged j
                   JOIN item_links k ON k.child_item_id = j.item_id AND k.link_type = 'installed_in' AND k.removed_at IS NULL
                   JOIN shipments s ON s.unit_item_id = k.parent_item_id AND s.returned_at IS NULL
                  WHERE NOT j.was_fail AND j.now_fail) AS shipped
           FROM judged`,
        { type: QueryTypes.SELECT, replacements: { station, bore: boreId } },
      );
      expect(hand).toEqual({ p2f: 2, f2p: 0, parts: 8, shipped: 1 });
      expect(s.counts).toMatchObject({
        parts: hand!.parts,
        partsPassToFail: hand!.p2f,
        partsFailToPass: hand!.f2p,
        shippedUnits: hand!.shipped,
        readingsPassToFail: 96, // both high blocks: all 48 bores at 4.0304 > 4.0303
      });
      expect(s.shipped).toEqual([expect.objectContaining({ unit: shippedUnit, part: shippedBlock })]);
      expect(s.parts.map((p: { serial: string }) => p.serial)).toContain(shippedBlock);
      // σ within comes from the frozen limits, so Cp changes with the tolerance alone: 0.0006/0.0010 (by hand)
      expect(s.sigmaSource).toBe('frozen limits');
      expect(s.after.cp / s.before.cp).toBeCloseTo(0.6, 9);
      expect(await AuditEvent.count({ where: { action: 'spec.rule_rehearsed', entityId: String(id) } })).toBe(1);

      // the same rehearsal through one gauge's readings (read from \`readings\`, not \`result_values\`)
      const gauges = await t.sequelize.query<{ code: string }>(
        `SELECT DISTINCT g.code FROM readings r JOIN gauges g ON g.id = r.gauge_id
           JOIN stage_results sr ON sr.id = r.stage_result_id
          WHERE sr.station_id = (SELECT id FROM stations WHERE code = :station) AND r.characteristic_id = :bore`,
        { type: QueryTypes.SELECT, replacements: { station, bore: boreId } },
      );
      expect(gauges).toHaveLength(1);
      const byGauge = await request(t.app)
        .post(`/api/spec/rules/${id}/rehearsals`)
        .set('Cookie', quality)
        .send({ from: started, to, station, gauge: gauges[0]!.code });
      expect(byGauge.status, JSON.stringify(byGauge.body)).toBe(201);
      expect(byGauge.body.summary.counts).toEqual(s.counts);
      expect(byGauge.body.summary.parts).toEqual(s.parts);

      // the draft changes: the rehearsal is stale and an approval naming it is refused
      const edited = await request(t.app)
        .patch(`/api/spec/rules/${id}`)
        .set('Cookie', quality)
        .send({
          limits: { limitType: 'nominal', nominal: 4.03, minusTol: 0.0004, plusTol: 0.0004, resolution: 0.0001 },
        });
      expect(edited.status).toBe(200);
      const listed = await request(t.app).get(`/api/spec/rules/${id}/rehearsals`).set('Cookie', supervisor);
      expect(listed.body.find((r: { id: number }) => r.id === res.body.id)).toMatchObject({ stale: true });
      const refused = await request(t.app)
        .post(`/api/spec/rules/${id}/approve`)
        .set('Cookie', quality2)
        .send({ reason: 'Tighter bores', password: TEST_PASSWORD, rehearsalId: res.body.id });
      expect(refused.status).toBe(409);
      expect((await RuleRehearsal.findByPk(res.body.id))!.keptWithApprovalAt).toBeNull();
    } finally {
      // the demo's CORRIE-8 bore stays at version 1 for the other files
      await request(t.app).post(`/api/spec/rules/${id}/discard`).set('Cookie', quality);
    }
  });
});

describe('bad input to the SPC routes', () => {
  const chart = { family: 'CORRIE-8', from: '2026-01-01', to: '2026-02-01' };
  it('when a query is malformed, then 400 names the field and nothing is read', async () => {
    const cases: [string, Record<string, string | number>, string][] = [
      ['/api/spc/chart', { ...chart, characteristicId: 'x' }, 'characteristicId'],
      ['/api/spc/chart', { ...chart, characteristicId: boreId, from: '2026-13-01' }, 'from'],
      ['/api/spc/chart', { ...chart, characteristicId: boreId, from: '2026-03-01' }, 'to'],
      ['/api/spc/chart', { ...chart, characteristicId: boreId, to: '2030-01-01' }, 'to'],
      ['/api/spc/chart', { ...chart, characteristicId: boreId, chart: 'pie' }, 'chart'],
      ['/api/spc/chart', { ...chart, characteristicId: boreId, subgroup: 1 }, 'subgroup'],
      ['/api/spc/chart', { ...chart, characteristicId: boreId, baselineFrom: '2026-01-05' }, 'baselineTo'],
      ['/api/spc/chart', { ...chart, characteristicId: boreId, colour: 'red' }, 'colour'],
      ['/api/spc/chart', { ...chart, characteristicId: boreId, station: 'NOPE-1' }, 'station'],
      ['/api/spc/chart', { ...chart, characteristicId: boreId, gauge: 'NOPE-1' }, 'gauge'],
      ['/api/spc/capability', { ...chart, characteristicId: boreId, chart: 'i-mr' }, 'chart'],
      ['/api/spc/signals', { family: 'CORRIE-8' }, 'characteristicId'],
      ['/api/spc/limits', { characteristicId: boreId }, 'family'],
    ];
    for (const [path, query, field] of cases) {
      const res = await q(path, quality, query);
      expect(res.status, `${path} ${JSON.stringify(query)}`).toBe(400);
      expect(Object.keys(res.body.error.fields ?? {}), `${path} ${JSON.stringify(query)}`).toContain(field);
    }
    const family = await q('/api/spc/chart', quality, { ...chart, family: 'NOPE', characteristicId: boreId });
    expect(family.status).toBe(404);
    const attribute = (await Characteristic.findOne({ where: { kind: 'attribute' } }))!;
    const pf = await q('/api/spc/chart', quality, { ...chart, characteristicId: attribute.id });
    expect(pf.status).toBe(400);
  });

  it('when a freeze, a hold or a rehearsal is malformed or impossible, then 4xx and nothing is written', async () => {
    const approved = (
      await t.sequelize.query<{ id: number }>(
        "SELECT id FROM tolerance_rules WHERE status = 'approved' ORDER BY id LIMIT 1",
        { type: QueryTypes.SELECT },
      )
    )[0]!;
    // counted where only this test writes: its station's limits, an approved rule's rehearsals, its supervisor's NCRs
    const written = async () => ({
      limits: await SpcLimits.count({ where: { stationId } }),
      rehearsals: await RuleRehearsal.count({ where: { toleranceRuleId: approved.id } }),
      ncrs: await Nonconformance.count({ where: { raisedById: supervisorId } }),
    });
    const before = await written();
    const freeze = (body: object) => request(t.app).post('/api/spc/limits').set('Cookie', quality).send(body);
    const good = { family: 'CORRIE-8', characteristicId: boreId, baselineFrom: '2026-01-01', baselineTo: '2026-02-01' };
    expect((await freeze({ ...good, reason: 'ok' })).status).toBe(400); // reason too short
    expect((await freeze({ ...good, reason: 'A real reason', baselineTo: '2025-01-01' })).status).toBe(400);
    expect((await freeze({ ...good, reason: 'A real reason', limits: { mean: 1 } })).status).toBe(400); // not allowed
    expect((await freeze({ ...good, reason: 'A real reason', station: 'NOPE-1' })).status).toBe(400);
    // a baseline without results at this station: nothing to freeze from
    const empty = await freeze({ ...good, reason: 'A real reason', station, baselineTo: '2026-01-02' });
    expect(empty.status).toBe(400);
    expect(empty.body.error.fields.baselineTo).toBeTruthy();

    const hold = (id: string, body: object) =>
      request(t.app).post(`/api/spc/signals/${id}/hold`).set('Cookie', supervisor).send(body);
    expect((await hold('abc', { reason: 'Looks wrong' })).status).toBe(400);
    expect((await hold('999999999', { reason: 'Looks wrong' })).status).toBe(404);
    expect((await hold('1', { reason: 'no' })).status).toBe(400);
    expect((await hold('1', { reason: 'Looks wrong', extra: 1 })).status).toBe(400);

    const rehearse = (id: string | number, body: object) =>
      request(t.app).post(`/api/spec/rules/${id}/rehearsals`).set('Cookie', quality).send(body);
    expect((await rehearse(999999999, { from: '2026-01-01', to: '2026-02-01' })).status).toBe(404);
    expect((await rehearse('x', { from: '2026-01-01', to: '2026-02-01' })).status).toBe(400);
    expect((await rehearse(approved.id, { from: '2026-01-01', to: '2026-02-01' })).status).toBe(409);
    expect((await rehearse(approved.id, { from: '2026-02-01', to: '2026-01-01' })).status).toBe(400);
    expect((await rehearse(approved.id, { from: '2026-01-01' })).status).toBe(400);
    expect((await request(t.app).get('/api/spec/rules/999999999/rehearsals').set('Cookie', quality)).status).toBe(404);
    // an approval naming a rehearsal of another rule is refused before anything is signed
    const approve = await request(t.app)
      .post(`/api/spec/rules/${approved.id}/approve`)
      .set('Cookie', quality2)
      .send({ reason: 'Nothing to approve', password: TEST_PASSWORD, rehearsalId: 'one' });
    expect(approve.status).toBe(400);

    expect(await written()).toEqual(before);
  });
});
