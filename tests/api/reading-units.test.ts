import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nominalSizeClasses, passingReadings } from '../../db/seeders/sample-readings.js';
import { Item, Reading, StageResult, UnitPreference } from '../../server/models/index.js';
import type { ReadingInput, StationFormJson } from '../../shared/schemas/results.js';
import { cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';
import { formFor, gaugesOf, passThrough, tornDownCore } from '../support/parts.js';

let t: TestApp;
let receiving: string;
let operator: string;
let operatorId: number;

beforeAll(async () => {
  t = makeTestApp();
  receiving = await cookieFor(await makeUser('receiving'), t.config);
  const op = await makeUser('operator');
  operatorId = op.id;
  operator = await cookieFor(op, t.config);
});
afterAll(() => t.close());

const submit = (station: string, serial: string, form: StationFormJson, readings: ReadingInput[]) =>
  request(t.app)
    .post('/api/results')
    .set('Cookie', operator)
    .send({
      idempotencyKey: randomUUID(),
      serial,
      station,
      ...gaugesOf(form),
      readings,
      sizeClasses: nominalSizeClasses(form),
    });

/** Replaces one reading's value and unit, as a tablet set to another unit sends it. */
const typedIn = (readings: ReadingInput[], characteristic: string, position: string, value: number, unit: string) =>
  readings.map((r) => (r.characteristic === characteristic && r.position === position ? { ...r, value, unit } : r));

async function blockAt(stations: string[]) {
  const parts = await tornDownCore(t, { receiving, operator }, 'CORRIE-8');
  await passThrough(t, operator, stations, parts.block);
  return parts.block;
}

describe('readings typed in another unit of the same quantity', () => {
  it('when a bore is typed in mm for an inch rule, then it is judged in inches and stored with the mm as typed', async () => {
    const serial = await blockAt(['CLN-1', 'MPI-1', 'PT-1', 'LH-1']);
    const form = await formFor(t, operator, 'BH-1', serial);
    // 102.36708 mm = 4.0302 in exactly (NIST SP 811: 1 in = 25.4 mm, exact); the rule is 4.030 ± 0.0005 in
    let readings = typedIn(passingReadings(form), 'bore', 'c1/top/thrust', 102.36708, 'mm');
    // 102.3 mm = 4.027559 in (÷ 25.4, recomputed): below 4.0295, so it fails in the rule's unit
    readings = typedIn(readings, 'bore', 'c2/top/thrust', 102.3, 'mm');
    const res = await submit('BH-1', serial, form, readings);
    expect(res.status).toBe(201);
    type R = { characteristic: string; position: string; value: number; unit: string; entered: unknown };
    const at = (p: string) => (res.body.readings as R[]).find((r) => r.characteristic === 'bore' && r.position === p)!;
    expect(at('c1/top/thrust')).toMatchObject({
      value: 4.0302,
      unit: 'in',
      verdict: 'pass',
      entered: { value: 102.36708, unit: 'mm' },
    });
    expect(at('c2/top/thrust')).toMatchObject({
      value: 4.027559, // 102.3 ÷ 25.4 = 4.027559 06…, kept to the column's 6 decimals
      unit: 'in',
      verdict: 'fail',
      lower: 4.0295,
      entered: { value: 102.3, unit: 'mm' },
    });
    expect(at('c3/top/thrust').entered).toBeNull();
    expect(res.body.verdict).toBe('fail');

    const stored = await Reading.findAll({ where: { stageResultId: res.body.id } });
    const row = stored.find((r) => r.position === 'c1/top/thrust' && r.unit === 'in')!;
    expect(Number(row.value)).toBe(4.0302);
    expect(Number(row.enteredValue)).toBe(102.36708);
    expect(row.enteredUnit).toBe('mm');
    expect(stored.filter((r) => r.enteredUnit !== null)).toHaveLength(2);

    // the item's history shows what was typed beside the judged value
    const history = await request(t.app).get(`/api/items/${serial}/results`).set('Cookie', operator);
    expect(history.status).toBe(200);
    const bore = history.body[0].readings.find((r: R) => r.characteristic === 'bore' && r.position === 'c1/top/thrust');
    expect(bore).toMatchObject({ value: 4.0302, unit: 'in', entered: { value: 102.36708, unit: 'mm' } });
  });

  it('when a test pressure is typed in kPa for a psi rule, then it is converted before rounding and judging', async () => {
    const serial = await blockAt(['CLN-1', 'MPI-1']);
    const form = await formFor(t, operator, 'PT-1', serial);
    // rule: at least 40 psi, resolution 1 psi. 272 kPa = 39.450 psi (÷ 6.894 757, NIST SP 811) → 39: fail
    const low = await submit('PT-1', serial, form, typedIn(passingReadings(form), 'test-pressure', '', 272, 'kPa'));
    expect(low.status).toBe(201);
    // 272 000 Pa ÷ 6 894.757 293 Pa/psi = 39.450 264 66 (NIST SP 811 factor, recomputed), kept to 6 decimals
    const r = low.body.readings.find((x: { characteristic: string }) => x.characteristic === 'test-pressure');
    expect(r).toMatchObject({ value: 39.450265, rounded: 39, verdict: 'fail', entered: { value: 272, unit: 'kPa' } });
  });

  it('when 2.76 bar is typed for a psi rule, then it reads 40.030 psi and passes on the limit', async () => {
    const serial = await blockAt(['CLN-1', 'MPI-1']);
    const form = await formFor(t, operator, 'PT-1', serial);
    // 2.76 bar = 276 kPa = 40.030 psi (NIST SP 811: bar 1.0 E+05 Pa, psi 6.894 757 E+03 Pa) → rounds to 40 (ASTM E29)
    const res = await submit('PT-1', serial, form, typedIn(passingReadings(form), 'test-pressure', '', 2.76, 'bar'));
    expect(res.status).toBe(201);
    expect(res.body.verdict).toBe('pass');
    // 276 000 Pa ÷ 6 894.757 293 Pa/psi = 40.030 415 61 (NIST SP 811 factor, recomputed), kept to 6 decimals
    const r = res.body.readings.find((x: { characteristic: string }) => x.characteristic === 'test-pressure');
    expect(r).toMatchObject({ value: 40.030416, rounded: 40, verdict: 'pass', entered: { value: 2.76, unit: 'bar' } });
  });

  it('when the unit is of another quantity, unknown, or converts outside the physical range, then 400 and nothing is written', async () => {
    const serial = await blockAt(['CLN-1', 'MPI-1', 'PT-1', 'LH-1']);
    const form = await formFor(t, operator, 'BH-1', serial);
    // this part's rows only: other files record results at the same time
    const item = await Item.findOne({ where: { serial } });
    const mine = async () => {
      const ids = (await StageResult.findAll({ where: { itemId: item!.id }, attributes: ['id'] })).map((r) => r.id);
      return { results: ids.length, readings: await Reading.count({ where: { stageResultId: ids } }) };
    };
    const before = await mine();
    const wrongQuantity = await submit(
      'BH-1',
      serial,
      form,
      typedIn(passingReadings(form), 'bore', 'c1/top/thrust', 102.4, 'psi'),
    );
    expect(wrongQuantity.status).toBe(400);
    expect(wrongQuantity.body.error.fields['bore@c1/top/thrust']).toMatch(/psi is not a unit of the same quantity/);
    const unknown = await submit(
      'BH-1',
      serial,
      form,
      typedIn(passingReadings(form), 'bore', 'c1/top/thrust', 4, 'cubit'),
    );
    expect(unknown.status).toBe(400);
    // 4.03 typed as mm is 0.158661 in: not a possible bore (the physical range is in inches)
    const slip = await submit(
      'BH-1',
      serial,
      form,
      typedIn(passingReadings(form), 'bore', 'c1/top/thrust', 4.03, 'mm'),
    );
    expect(slip.status).toBe(400);
    expect(slip.body.error.fields['bore@c1/top/thrust']).toMatch(/^4\.03 mm \(0\.158661 in\) is not a possible/);
    // 99 999 999 ft is 1 199 999 988 in (× 12): beyond what a numeric(14, 6) reading holds
    const huge = await submit(
      'BH-1',
      serial,
      form,
      typedIn(passingReadings(form), 'bore', 'c1/top/thrust', 99999999, 'ft'),
    );
    expect(huge.status).toBe(400);
    expect(huge.body.error.fields['bore@c1/top/thrust']).toMatch(/beyond what a reading in in can hold/);
    expect(await mine()).toEqual(before);
  });
});

describe('the unit an operator prefers to type in', () => {
  const put = (body: object) => request(t.app).put('/api/auth/unit-preferences').set('Cookie', operator).send(body);

  it('when an operator sets mm for inch characteristics, then it is remembered, replaced and forgotten on request', async () => {
    expect((await put({ unit: 'in', enteredUnit: 'mm' })).body).toEqual({ preferences: { in: 'mm' } });
    expect((await put({ unit: 'psi', enteredUnit: 'kPa' })).body).toEqual({ preferences: { in: 'mm', psi: 'kPa' } });
    expect((await put({ unit: 'in', enteredUnit: 'µm' })).body.preferences.in).toBe('µm');
    const got = await request(t.app).get('/api/auth/unit-preferences').set('Cookie', operator);
    expect(got.body).toEqual({ preferences: { in: 'µm', psi: 'kPa' } });
    expect((await put({ unit: 'in', enteredUnit: null })).body).toEqual({ preferences: { psi: 'kPa' } });
    // another person's preferences are their own
    const other = await cookieFor(await makeUser('operator'), t.config);
    expect((await request(t.app).get('/api/auth/unit-preferences').set('Cookie', other)).body).toEqual({
      preferences: {},
    });
  });

  it('when the units do not convert, are unknown or the same, then 400 and nothing is stored', async () => {
    const before = await UnitPreference.count({ where: { userId: operatorId } });
    for (const body of [
      { unit: 'in', enteredUnit: 'psi' },
      { unit: 'in', enteredUnit: 'in' },
      { unit: 'furlong', enteredUnit: 'mm' },
      { unit: 'in', enteredUnit: 'mm', extra: 1 },
      { unit: 'in' },
    ]) {
      const res = await put(body);
      expect(res.status, JSON.stringify(body)).toBe(400);
    }
    expect(await UnitPreference.count({ where: { userId: operatorId } })).toBe(before);
    expect(
      (await request(t.app).put('/api/auth/unit-preferences').send({ unit: 'in', enteredUnit: 'mm' })).status,
    ).toBe(401);
  });
});
