import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nominalSizeClasses, passingReadings } from '../../db/seeders/sample-readings.js';
import { AuditEvent, IdempotencyKey, Item, Nonconformance, Reading, StageResult } from '../../server/models/index.js';
import type { ReadingInput, StationFormJson } from '../../shared/schemas/results.js';
import { cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';
import { formFor, gaugesOf, pass, passThrough, tornDownCore } from '../support/parts.js';

let t: TestApp;
let receiving: string;
let operator: string;
let operator2: string;
let supervisor: string;

beforeAll(async () => {
  t = makeTestApp();
  receiving = await cookieFor(await makeUser('receiving'), t.config);
  operator = await cookieFor(await makeUser('operator', { name: 'Test operator' }), t.config);
  operator2 = await cookieFor(await makeUser('operator', { name: 'Second operator' }), t.config);
  supervisor = await cookieFor(await makeUser('supervisor'), t.config);
});
afterAll(() => t.close());

/** A Corrie V8 block that has passed every stage before bore and hone. */
async function blockAtBoreHone() {
  const parts = await tornDownCore(t, { receiving, operator }, 'CORRIE-8');
  await passThrough(t, operator, ['CLN-1', 'MPI-1', 'PT-1', 'LH-1'], parts.block);
  return parts.block;
}

const submit = (cookie: string, body: Record<string, unknown>) =>
  request(t.app).post('/api/results').set('Cookie', cookie).send(body);

function boreBody(serial: string, form: StationFormJson, readings: ReadingInput[], key = randomUUID()) {
  return {
    idempotencyKey: key,
    serial,
    station: 'BH-1',
    ...gaugesOf(form),
    readings,
    sizeClasses: nominalSizeClasses(form),
  };
}

/** What is stored for one part (results, their readings, NCRs): other files write to the same database at once. */
async function counts(serial: string) {
  const item = (await Item.findOne({ where: { serial } }))!;
  const results = (await StageResult.findAll({ where: { itemId: item.id }, attributes: ['id'] })).map((r) => r.id);
  return {
    results: results.length,
    readings: await Reading.count({ where: { stageResultId: results } }),
    ncrs: await Nonconformance.count({ where: { itemId: item.id } }),
  };
}

describe('the station form', () => {
  it('lays out a V8 block at bore and hone: 8 cylinders × 3 depths × 2 axes by bank, with the rules in force', async () => {
    const serial = await blockAtBoreHone();
    const form = await formFor(t, operator, 'BH-1', serial);
    expect(form.sequence).toMatchObject({ ok: true, code: 'ready' });
    expect(form.stage.hazard).toMatch(/procedure/);
    const bore = form.characteristics.find((c) => c.code === 'bore')!;
    expect(bore.positions).toHaveLength(48);
    expect(bore.positions.filter((p) => p.group === 'Left bank').map((p) => p.cylinder)).toEqual(
      [1, 2, 3, 4].flatMap((c) => Array(6).fill(c)),
    );
    expect(bore.rule).toMatchObject({ version: 1, limitType: 'nominal', nominal: 4.03, minusTol: 0.0005 });
    expect(form.characteristics.find((c) => c.code === 'bore-oor')!.positions).toHaveLength(24);
    expect(form.characteristics.find((c) => c.code === 'bore-taper')!.positions).toHaveLength(8);
    const overdue = form.gauges.find((g) => g.code === 'BG-009')!;
    expect(overdue).toMatchObject({ usable: false });
    expect(overdue.why).toMatch(/Calibration was due/);
  });

  it('says plainly when the stage is not the part’s next one, and refuses to record it (409)', async () => {
    const parts = await tornDownCore(t, { receiving, operator }, 'CORRIE-8');
    const form = await formFor(t, operator, 'BH-1', parts.block);
    expect(form.sequence).toMatchObject({ ok: false, code: 'out_of_sequence', expectedStage: { code: 'block-clean' } });
    expect(form.sequence.message).toBe(`${parts.block} is not ready for Bore and hone: its next stage is Block clean.`);
    const before = await counts(parts.block);
    const res = await submit(operator, boreBody(parts.block, form, passingReadings(form)));
    expect(res.status).toBe(409);
    expect(res.body.error).toMatchObject({ reason: 'out_of_sequence', expectedStage: { code: 'block-clean' } });
    expect(await counts(parts.block)).toEqual(before);
    const head = await formFor(t, operator, 'BH-1', parts.heads[0]!);
    expect(head.sequence).toMatchObject({ ok: false, code: 'wrong_part' });
  });
});

describe('recording a result', () => {
  it('when one bore reading is out of tolerance, then the result fails, an NCR names it and the block is held', async () => {
    const serial = await blockAtBoreHone();
    const form = await formFor(t, operator, 'BH-1', serial);
    // 4.0306 in is above 4.030 + 0.0005 in; every other reading sits on the nominal
    const readings = passingReadings(form, (c, p, v) => (c === 'bore' && p === 'c6/middle/thrust' ? 4.0306 : v));
    const res = await submit(operator, boreBody(serial, form, readings));
    expect(res.status).toBe(201);
    expect(res.body.verdict).toBe('fail');
    // cylinder 6 is 0.0006 in out of round at mid depth, within its 0.001 in: only the diameter fails
    expect(
      res.body.failing.map((r: { characteristic: string; position: string }) => [r.characteristic, r.position]),
    ).toEqual([['bore', 'c6/middle/thrust']]);
    expect(res.body.failing[0]).toMatchObject({ rounded: 4.0306, upper: 4.0305, ruleVersion: 1, verdict: 'fail' });
    expect(res.body.nonconformance.number).toMatch(/^NC-\d{4}-\d{5}$/);
    expect(res.body.item).toEqual({ status: 'on_hold', currentStage: { code: 'bore-hone', name: 'Bore and hone' } });

    const ncr = (await Nonconformance.findOne({ where: { number: res.body.nonconformance.number } }))!;
    expect(ncr.state).toBe('raised');
    expect(ncr.stageResultId).toBe(res.body.id);
    expect(ncr.description).toContain('Cylinder bore diameter at cylinder 6, middle, thrust');
    expect(ncr.failing[0]).toMatchObject({ characteristic: 'bore', position: 'c6/middle/thrust', value: 4.0306 });
    const stored = await Reading.findAll({ where: { stageResultId: res.body.id } });
    expect(stored).toHaveLength(48 + 24 + 8 + 1);
    expect(stored.every((r) => r.ruleVersion === 1 && r.toleranceRuleId !== null)).toBe(true);
    const actions = (await AuditEvent.findAll({ where: { requestId: res.headers['x-request-id'] } })).map(
      (e) => e.action,
    );
    expect(actions).toEqual(['ncr.raised', 'result.recorded', 'item.held']);

    // the held part is refused at the station, naming the NCR
    const again = await formFor(t, operator, 'BH-1', serial);
    expect(again.sequence).toMatchObject({ ok: false, code: 'on_hold' });
    expect(again.sequence.message).toContain(ncr.number);
    const retry = await submit(operator, boreBody(serial, again, passingReadings(again)));
    expect(retry.status).toBe(409);
    expect(retry.body.error.message).toContain(ncr.number);
  });

  it('when every reading passes, then the block moves on to its next stage', async () => {
    const serial = await blockAtBoreHone();
    const body = await pass(t, operator, 'BH-1', serial);
    expect(body.nonconformance).toBeNull();
    expect(body.item).toEqual({
      status: 'in_process',
      currentStage: { code: 'block-deck', name: 'Block deck resurface' },
    });
    expect((await Item.findOne({ where: { serial } }))!.status).toBe('in_process');
  });

  it('judges derived characteristics like typed ones, a value exactly on the limit passing', async () => {
    const serial = await blockAtBoreHone();
    const form = await formFor(t, operator, 'BH-1', serial);
    const readings = passingReadings(form, (c, p, v) => {
      if (c !== 'bore' || !p.startsWith('c2/')) return v;
      if (p === 'c2/top/thrust') return 4.0305;
      if (p === 'c2/bottom/thrust') return 4.0295;
      return v;
    });
    const res = await submit(operator, boreBody(serial, form, readings));
    expect(res.status).toBe(201);
    // 4.0305 − 4.0295 = 0.0010: on the limit, so it passes (limits are inclusive)
    expect(res.body.verdict).toBe('pass');
    const taper = res.body.readings.find(
      (r: { characteristic: string; position: string }) => r.characteristic === 'bore-taper' && r.position === 'c2',
    );
    expect(taper).toMatchObject({ value: 0.001, verdict: 'pass', upper: 0.001 });

    const serial2 = await blockAtBoreHone();
    const form2 = await formFor(t, operator, 'BH-1', serial2);
    const readings2 = passingReadings(form2, (c, p, v) => {
      if (p === 'c2/top/thrust' && c === 'bore') return 4.0305;
      if (p === 'c2/bottom/thrust' && c === 'bore') return 4.0293;
      return v;
    });
    const res2 = await submit(operator, boreBody(serial2, form2, readings2));
    expect(res2.body.verdict).toBe('fail');
    expect(
      res2.body.failing.map((r: { characteristic: string; position: string }) => `${r.characteristic}@${r.position}`),
    ).toEqual(['bore@c2/bottom/thrust', 'bore-taper@c2']);
    const taper2 = res2.body.failing[1];
    expect(taper2).toMatchObject({ value: 0.0012, reason: '0.0012 in is above the upper limit 0.001 in' });
  });
});

describe('idempotency and concurrency', () => {
  it('when a tablet retries with the same key, then it gets the first reply and one result is stored', async () => {
    const serial = await blockAtBoreHone();
    const form = await formFor(t, operator, 'BH-1', serial);
    const body = boreBody(serial, form, passingReadings(form));
    const first = await submit(operator, body);
    expect(first.status).toBe(201);
    const second = await submit(operator, body);
    expect(second.status).toBe(201);
    expect(second.headers['idempotent-replayed']).toBe('true');
    expect(second.body).toEqual(first.body);
    expect(await StageResult.count({ where: { idempotencyKey: body.idempotencyKey } })).toBe(1);
    expect(await IdempotencyKey.count({ where: { key: body.idempotencyKey } })).toBe(1);
  });

  it('when a key is reused with a different body, then 422 and nothing is stored', async () => {
    const serial = await blockAtBoreHone();
    const form = await formFor(t, operator, 'BH-1', serial);
    const body = boreBody(serial, form, passingReadings(form));
    expect((await submit(operator, body)).status).toBe(201);
    const before = await counts(serial);
    const other = await submit(operator, { ...body, notes: 'changed my mind' });
    expect(other.status).toBe(422);
    expect(other.body.error.code).toBe('idempotency_key_reused');
    // another person's request with the key is refused the same way
    const stranger = await submit(operator2, body);
    expect(stranger.status).toBe(422);
    expect(await counts(serial)).toEqual(before);
  });

  it('when two tablets submit the same stage for the same part at once, then one result is stored and the other is told why', async () => {
    const serial = await blockAtBoreHone();
    const form = await formFor(t, operator, 'BH-1', serial);
    const [a, b] = await Promise.all([
      submit(operator, boreBody(serial, form, passingReadings(form))),
      submit(operator2, boreBody(serial, form, passingReadings(form))),
    ]);
    const statuses = [a.status, b.status].sort();
    expect(statuses).toEqual([201, 409]);
    const loser = a.status === 409 ? a : b;
    expect(loser.body.error.reason).toBe('already_recorded');
    expect(loser.body.error.message).toMatch(/Bore and hone was already recorded for .* by (Test|Second) operator/);
    const item = (await Item.findOne({ where: { serial } }))!;
    // clean, crack, pressure, line hone and one bore-and-hone result
    expect(await StageResult.count({ where: { itemId: item.id } })).toBe(5);
  });

  it('when the same key arrives twice at once, then one result is stored and both replies agree', async () => {
    const serial = await blockAtBoreHone();
    const form = await formFor(t, operator, 'BH-1', serial);
    const body = boreBody(serial, form, passingReadings(form));
    const [a, b] = await Promise.all([submit(operator, body), submit(operator, body)]);
    expect([a.status, b.status]).toEqual([201, 201]);
    expect(a.body.id).toBe(b.body.id);
    expect(await StageResult.count({ where: { idempotencyKey: body.idempotencyKey } })).toBe(1);
  });
});

describe('bad readings are refused field by field and nothing is stored', () => {
  let serial: string;
  let form: StationFormJson;
  let good: ReadingInput[];
  beforeAll(async () => {
    serial = await blockAtBoreHone();
    form = await formFor(t, operator, 'BH-1', serial);
    good = passingReadings(form);
  });
  const replace = (position: string, patch: Record<string, unknown>) =>
    good.map((r) => (r.characteristic === 'bore' && r.position === position ? { ...r, ...patch } : r));

  const cases: [string, () => unknown[], string, RegExp][] = [
    [
      'a missing position',
      () => good.filter((r) => r.position !== 'c3/top/axial'),
      'bore@c3/top/axial',
      /Missing: Cylinder 3, top, axial/,
    ],
    // mm converts now (issue 16, tests/api/reading-units.test.ts); a unit of another quantity cannot
    [
      'a unit of another quantity',
      () => replace('c1/top/thrust', { unit: 'psi' }),
      'bore@c1/top/thrust',
      /recorded in in: psi is not a unit of the same quantity/,
    ],
    [
      'a value far outside the physical range',
      () => replace('c1/top/thrust', { value: 40.3 }),
      'bore@c1/top/thrust',
      /not a possible cylinder bore diameter \(2–6 in\)/,
    ],
    [
      'a position the part does not have',
      () => [...good, { characteristic: 'bore', position: 'c9/top/thrust', value: 4.03 }],
      'bore@c9/top/thrust',
      /not a position/,
    ],
    ['a reading sent twice', () => [...good, good[0]], 'bore@c1/top/thrust', /sent twice/],
    [
      'a derived value sent in',
      () => [...good, { characteristic: 'bore-taper', position: 'c1', value: 0 }],
      'bore-taper@c1',
      /worked out by Coretrail/,
    ],
    [
      'pass/fail for a measured value',
      () => replace('c1/top/thrust', { value: undefined, passed: true }),
      'bore@c1/top/thrust',
      /send a value/,
    ],
  ];
  for (const [what, readings, field, message] of cases) {
    it(`refuses ${what}`, async () => {
      const before = await counts(serial);
      const res = await submit(operator, boreBody(serial, form, readings() as ReadingInput[]));
      expect(res.status).toBe(400);
      expect(res.body.error.fields[field]).toMatch(message);
      expect(await counts(serial)).toEqual(before);
    });
  }

  it('refuses text for a number, NaN and Infinity with the field named', async () => {
    const before = await counts(serial);
    const text = await submit(operator, boreBody(serial, form, replace('c1/top/thrust', { value: '4.03x' }) as never));
    expect(text.status).toBe(400);
    expect(text.body.error.fields['readings.0.value']).toBe('Enter a number.');
    const nan = await submit(operator, boreBody(serial, form, replace('c1/top/thrust', { value: 'NaN' }) as never));
    expect(nan.body.error.fields['readings.0.value']).toBe('Enter a number.');
    // JSON cannot carry NaN or Infinity; 1e999 is how Infinity arrives, and JSON.parse makes it Infinity
    const raw = JSON.stringify(boreBody(serial, form, good)).replace('"value":4.03', '"value":1e999');
    const inf = await request(t.app)
      .post('/api/results')
      .set('Cookie', operator)
      .set('Content-Type', 'application/json')
      .send(raw);
    expect(inf.status).toBe(400);
    expect(Object.keys(inf.body.error.fields)[0]).toMatch(/^readings\.\d+\.value$/);
    expect(await counts(serial)).toEqual(before);
  });

  it('refuses a gauge past its calibration date, and a missing gauge', async () => {
    const before = await counts(serial);
    const overdue = await submit(operator, { ...boreBody(serial, form, good), gauge: 'BG-009' });
    expect(overdue.status).toBe(400);
    expect(overdue.body.error.fields.gauge).toMatch(/Calibration was due on/);
    const none = await submit(operator, { ...boreBody(serial, form, good), gauge: null });
    expect(none.body.error.fields.gauge).toBe('Choose the gauge used.');
    expect(await counts(serial)).toEqual(before);
  });

  it('lets a crack-test failure through only with a location', async () => {
    const parts = await tornDownCore(t, { receiving, operator }, 'TARN-6');
    await pass(t, operator, 'CLN-1', parts.block);
    const crack = await formFor(t, operator, 'MPI-1', parts.block);
    const base = { idempotencyKey: randomUUID(), serial: parts.block, station: 'MPI-1', gauge: null };
    const noWhere = await submit(operator, {
      ...base,
      readings: [{ characteristic: 'crack-free', passed: false }],
    });
    expect(noWhere.status).toBe(400);
    expect(noWhere.body.error.fields['crack-free@']).toMatch(/say where/);
    const res = await submit(operator, {
      ...base,
      readings: [{ characteristic: 'crack-free', passed: false, location: 'Cylinder 4 wall, thrust side' }],
    });
    expect(res.status).toBe(201);
    expect(res.body.verdict).toBe('fail');
    expect(res.body.nonconformance.severity).toBe('critical');
    expect(res.body.failing[0].location).toBe('Cylinder 4 wall, thrust side');
    expect(crack.stage.hazard).toMatch(/magnetic/i);
  });
});

describe('results are records', () => {
  it('when a supervisor corrects a result, then a new result supersedes it and both stay in the history', async () => {
    const serial = await blockAtBoreHone();
    const first = await pass(t, operator, 'BH-1', serial);
    const form = await formFor(t, supervisor, 'BH-1', serial);
    expect(form.currentResult).toMatchObject({ id: first.id, verdict: 'pass' });
    const body = {
      ...boreBody(
        serial,
        form,
        passingReadings(form, (c, _p, v) => (c === 'bore-finish' ? 30 : v)),
      ),
      reason: 'Finish was read off the wrong profilometer trace',
    };
    const byOperator = await request(t.app)
      .post(`/api/results/${first.id}/correction`)
      .set('Cookie', operator)
      .send(body);
    expect(byOperator.status).toBe(403);
    const res = await request(t.app).post(`/api/results/${first.id}/correction`).set('Cookie', supervisor).send(body);
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ supersedes: first.id, correctionReason: body.reason, verdict: 'pass' });
    // correcting the superseded one again is refused: only the current result can be corrected
    const stale = await request(t.app)
      .post(`/api/results/${first.id}/correction`)
      .set('Cookie', supervisor)
      .send({ ...body, idempotencyKey: randomUUID() });
    expect(stale.status).toBe(409);
    const history = await request(t.app).get(`/api/items/${serial}/results`).set('Cookie', operator);
    const bore = history.body.filter((r: { stage: { code: string } }) => r.stage.code === 'bore-hone');
    expect(bore.map((r: { id: number; supersededBy: number | null }) => [r.id, r.supersededBy])).toEqual([
      [res.body.id, null],
      [first.id, res.body.id],
    ]);
    // the block stayed where the first pass sent it
    expect((await Item.findOne({ where: { serial } }))!.currentStageId).not.toBeNull();
  });

  it('the database itself refuses to edit or delete a recorded result or reading', async () => {
    const r = (await Reading.findOne())!;
    await expect(t.sequelize.query(`UPDATE readings SET value = 0 WHERE id = ${r.id}`)).rejects.toThrow(/records/);
    await expect(t.sequelize.query(`DELETE FROM stage_results WHERE id = ${r.stageResultId}`)).rejects.toThrow(
      /records/,
    );
  });

  it('a supervisor can allow a re-entry with a reason; the next result there carries it', async () => {
    const serial = await blockAtBoreHone();
    await pass(t, operator, 'BH-1', serial);
    const refused = await formFor(t, operator, 'BH-1', serial);
    expect(refused.sequence).toMatchObject({ ok: false, code: 'out_of_sequence' });
    expect(refused.sequence.message).toMatch(/already passed Bore and hone; its next stage is Block deck resurface/);
    const byOperator = await request(t.app)
      .post(`/api/items/${serial}/reentry`)
      .set('Cookie', operator)
      .send({ stage: 'bore-hone', reason: 'Re-hone after deck' });
    expect(byOperator.status).toBe(403);
    const ok = await request(t.app)
      .post(`/api/items/${serial}/reentry`)
      .set('Cookie', supervisor)
      .send({ stage: 'bore-hone', reason: 'Customer asked for a plateau finish' });
    expect(ok.status).toBe(200);
    const form = await formFor(t, operator, 'BH-1', serial);
    expect(form.sequence).toMatchObject({ ok: true, code: 'reentry' });
    const res = await pass(t, operator, 'BH-1', serial);
    expect(res.reentryReason).toBe('Customer asked for a plateau finish');
    expect(res.item.currentStage.code).toBe('block-deck');
  });
});

describe('gauges', () => {
  it('a measured characteristic read with another gauge keeps that gauge on its readings', async () => {
    const serial = await blockAtBoreHone();
    const form = await formFor(t, operator, 'BH-1', serial);
    const res = await submit(operator, {
      ...boreBody(serial, form, passingReadings(form)),
      gauge: 'BG-014',
      gauges: { 'bore-finish': 'PR-007' },
    });
    expect(res.status).toBe(201);
    const rows = (await t.sequelize.query(
      `SELECT c.code, g.code AS gauge FROM readings r JOIN characteristics c ON c.id = r.characteristic_id
         LEFT JOIN gauges g ON g.id = r.gauge_id WHERE r.stage_result_id = ${res.body.id} GROUP BY 1, 2 ORDER BY 1`,
      { type: 'SELECT' },
    )) as { code: string; gauge: string | null }[];
    expect(rows).toEqual([
      { code: 'bore', gauge: 'BG-014' },
      { code: 'bore-finish', gauge: 'PR-007' },
      { code: 'bore-oor', gauge: null },
      { code: 'bore-taper', gauge: null },
    ]);
    const serial2 = await blockAtBoreHone();
    const form2 = await formFor(t, operator, 'BH-1', serial2);
    const overdue = await submit(operator, {
      ...boreBody(serial2, form2, passingReadings(form2)),
      gauges: { 'bore-finish': 'BG-009' },
    });
    expect(overdue.status).toBe(400);
    expect(overdue.body.error.fields['gauges.bore-finish']).toMatch(/Calibration was due/);
  });
});
