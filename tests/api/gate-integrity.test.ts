import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { Op } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nominalSizeClasses, passingReadings } from '../../db/seeders/sample-readings.js';
import { Characteristic, Customer, MailOutbox } from '../../server/models/index.js';
import { TEST_PASSWORD, cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';
import { pngImage } from '../support/images.js';
import { formFor, gaugesOf, pass, releasableUnit, tornDownCore } from '../support/parts.js';

/** What the release gate and the records got wrong, each seen once by hand and now held by a test. */

let t: TestApp;
let cookies: { receiving: string; operator: string };
let shipping: string;
let quality: string;
let quality2: string;
let quality2Email: string;
let quality1Email: string;
let customerId: number;

beforeAll(async () => {
  t = makeTestApp();
  cookies = {
    receiving: await cookieFor(await makeUser('receiving'), t.config),
    operator: await cookieFor(await makeUser('operator', { name: 'Gate Operator' }), t.config),
  };
  shipping = await cookieFor(await makeUser('shipping', { name: 'Gate Shipper' }), t.config);
  const q1 = await makeUser('quality', { name: 'Gate Quality One' });
  const q2 = await makeUser('quality', { name: 'Gate Quality Two' });
  quality1Email = q1.email;
  quality2Email = q2.email;
  quality = await cookieFor(q1, t.config);
  quality2 = await cookieFor(q2, t.config);
  customerId = (await Customer.findOne({ order: [['id', 'ASC']] }))!.id;
});
afterAll(() => t.close());

const post = (cookie: string, url: string, body: object = {}) =>
  request(t.app).post(url).set('Cookie', cookie).send(body);
const get = (cookie: string, url: string) => request(t.app).get(url).set('Cookie', cookie);
const tag = () => `G${randomUUID().slice(0, 6).toUpperCase()}`;

async function decide(number: string, body: object) {
  await post(quality, `/api/ncrs/${number}/review`);
  const res = await post(quality, `/api/ncrs/${number}/disposition`, { password: TEST_PASSWORD, ...body });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body;
}

describe('closed is not the same as harmless', () => {
  it('when a lot in a built unit is returned to its supplier, then the unit is not releasable and says why', async () => {
    const lots = tag();
    const { unit } = await releasableUnit(t, cookies, 'TARN-6', lots);
    const raised = await post(cookies.operator, '/api/ncrs', {
      lotCode: `${lots}-PISTONS`,
      description: 'Ring lands machined off-centre on this lot',
      severity: 'major',
      defectCode: 'LOT',
    });
    expect(raised.status).toBe(201);
    const decided = await decide(raised.body.number, {
      disposition: 'return_to_supplier',
      reason: 'Supplier takes the lot back',
    });
    expect(decided.state).toBe('closed');
    const check = await get(shipping, `/api/units/${unit}/release-check`);
    expect(check.body.releasable).toBe(false);
    const reason = check.body.reasons.find((r: { code: string }) => r.code === 'lot_unusable');
    expect(reason.message).toMatch(new RegExp(`${lots}-PISTONS.*returned to the supplier`));
    expect(reason.link).toBe(`/lots/${lots}-PISTONS`);
  });

  it('when an installed head is scrapped after assembly, then its unit is not releasable and says why', async () => {
    const { unit, parts } = await releasableUnit(t, cookies, 'TARN-6', tag());
    const head = parts.heads[0]!;
    const raised = await post(cookies.operator, '/api/ncrs', {
      serial: head,
      description: 'Crack between the valve seats seen through the port',
      severity: 'critical',
      defectCode: 'CRK',
    });
    expect(raised.status).toBe(201);
    const decided = await decide(raised.body.number, { disposition: 'scrap', reason: 'Cracked through the seat' });
    expect(decided.item.status).toBe('scrapped');
    const check = await get(shipping, `/api/units/${unit}/release-check`);
    expect(check.body.releasable).toBe(false);
    const reason = check.body.reasons.find((r: { code: string }) => r.code === 'part_scrapped');
    expect(reason).toMatchObject({ serial: head, link: `/items/${head}` });
    expect(reason.message).toMatch(/scrapped/);
  });
});

describe('ship dates', () => {
  it('when a unit built minutes ago is released with a ship date three years back, then it is refused and nothing ships', async () => {
    const { unit } = await releasableUnit(t, cookies, 'TARN-6', tag());
    const back = new Date(Date.now() - 3 * 365 * 86_400_000).toISOString().slice(0, 10);
    const res = await post(shipping, `/api/units/${unit}/release`, {
      customerId,
      reference: `OLD-${unit}`,
      shipDate: back,
      password: TEST_PASSWORD,
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.shipDate).toMatch(/before/);
    expect((await get(shipping, `/api/units/${unit}/release-check`)).body.releasable).toBe(true);
  });
});

describe('separation of duties', () => {
  it('when the author of a draft rule approves it, then it is refused; another quality engineer can', async () => {
    // a characteristic no other test drafts on: the head face finish of the six
    const book = await get(quality, '/api/spec/book?family=TARN-6');
    const finish = book.body.stages
      .find((s: { code: string }) => s.code === 'head-deck')
      .characteristics.find((c: { code: string }) => c.code === 'deck-finish');
    const draft = await post(quality, '/api/spec/rules', {
      family: 'TARN-6',
      characteristicId: finish.id,
      limits: { limitType: 'range', lowerLimit: 60, upperLimit: 95, resolution: 1, sourceNote: 'MLS trial' },
    });
    expect(draft.status, JSON.stringify(draft.body)).toBe(201);
    const own = await post(quality, `/api/spec/rules/${draft.body.id}/approve`, {
      reason: 'My own draft',
      password: TEST_PASSWORD,
    });
    expect(own.status).toBe(403);
    expect(own.body.error.message).toMatch(/another quality engineer/);
    const other = await post(quality2, `/api/spec/rules/${draft.body.id}/approve`, {
      reason: 'Checked against the drawing',
      password: TEST_PASSWORD,
    });
    expect(other.status).toBe(200);
  });
});

describe('records that tell the truth', () => {
  it('when a failing result carries a photo, then its NCR shows the photo too', async () => {
    const parts = await tornDownCore(t, cookies, 'TARN-6');
    await pass(t, cookies.operator, 'CLN-1', parts.block);
    const up = await request(t.app)
      .post('/api/attachments')
      .set('Cookie', cookies.operator)
      .attach('file', pngImage(), 'crack.png');
    expect(up.status).toBe(201);
    const res = await post(cookies.operator, '/api/results', {
      idempotencyKey: randomUUID(),
      serial: parts.block,
      station: 'MPI-1',
      readings: [{ characteristic: 'crack-free', passed: false, location: 'Water jacket, cylinder 3' }],
      photoIds: [up.body.id],
    });
    expect(res.status).toBe(201);
    const ncr = await get(quality, `/api/ncrs/${res.body.nonconformance.number}`);
    expect(ncr.body.photos.map((p: { id: number }) => p.id)).toContain(up.body.id);
  });

  it('when a critical use-as-is is signed twice, then each signature shows its own signer, meaning, reason and time, and the countersigner is asked by mail', async () => {
    const parts = await tornDownCore(t, cookies, 'TARN-6');
    await pass(t, cookies.operator, 'CLN-1', parts.block);
    const crack = await post(cookies.operator, '/api/results', {
      idempotencyKey: randomUUID(),
      serial: parts.block,
      station: 'MPI-1',
      readings: [{ characteristic: 'crack-free', passed: false, location: 'Casting flash at the rear face' }],
    });
    const number = crack.body.nonconformance.number as string;
    await post(quality, `/api/ncrs/${number}/review`);
    const first = await post(quality, `/api/ncrs/${number}/disposition`, {
      disposition: 'use_as_is',
      reason: 'Indication is casting flash, dressed off',
      password: TEST_PASSWORD,
    });
    expect(first.status).toBe(200);
    // the other quality engineers are asked to countersign, the first signer is not
    const asks = await MailOutbox.findAll({
      where: { reason: 'ncr.countersign_requested', subject: { [Op.like]: `%${number}%` } },
    });
    const to = asks.map((m) => m.toAddress);
    expect(to).toContain(quality2Email);
    expect(to).not.toContain(quality1Email);
    const waiting = await get(quality2, '/api/ncrs?awaiting=me');
    expect(waiting.body.rows.map((r: { number: string }) => r.number)).toContain(number);

    const second = await post(quality2, `/api/ncrs/${number}/countersign`, {
      reason: 'Seen it under the lamp: flash',
      password: TEST_PASSWORD,
    });
    expect(second.status).toBe(200);
    expect(second.body.signatures).toEqual([
      expect.objectContaining({
        printedName: 'Gate Quality One',
        meaning: expect.stringMatching(/^First signature/),
        reason: 'Indication is casting flash, dressed off',
        signedAt: expect.any(String),
      }),
      expect.objectContaining({
        printedName: 'Gate Quality Two',
        meaning: expect.stringMatching(/^Second signature/),
        reason: 'Seen it under the lamp: flash',
      }),
    ]);
    const timeline = second.body.timeline as { actor: string; reason: string; to: string | null }[];
    const signedFirst = timeline.find((e) => e.actor === 'Gate Quality One' && /casting flash/.test(e.reason));
    expect(signedFirst).toBeDefined();
    const decided = timeline.find((e) => e.to === 'decided')!;
    expect(decided.actor).toBe('Gate Quality Two');
    expect(decided.reason).toMatch(/Seen it under the lamp/);
  });

  it('when a pressure test fails on a short hold time with no leak, then the NCR carries the hold time’s own defect code', async () => {
    const parts = await tornDownCore(t, cookies, 'TARN-6');
    await pass(t, cookies.operator, 'CLN-1', parts.block);
    await pass(t, cookies.operator, 'MPI-1', parts.block);
    const form = await formFor(t, cookies.operator, 'PT-1', parts.block);
    const res = await post(cookies.operator, '/api/results', {
      idempotencyKey: randomUUID(),
      serial: parts.block,
      station: 'PT-1',
      ...gaugesOf(form),
      readings: passingReadings(form, (c, _p, v) => (c === 'hold-time' ? 1 : v)),
      sizeClasses: nominalSizeClasses(form),
    });
    expect(res.body.verdict).toBe('fail');
    expect(res.body.failing.map((r: { characteristic: string }) => r.characteristic)).toEqual(['hold-time']);
    const ncr = await get(quality, `/api/ncrs/${res.body.nonconformance.number}`);
    expect(ncr.body.defectCode).not.toBe('LEAK');
    const holdTime = (await Characteristic.findOne({ where: { code: 'hold-time' } }))!;
    expect(ncr.body.defectCode).toBe(holdTime.defectCode);
  });

  it('when a run test leaves its optional torque empty, then no torque gauge is recorded for it', async () => {
    const { unit } = await releasableUnit(t, cookies, 'TARN-6', tag());
    // the unit has passed its run test already; a supervisor re-entry lets it be run again
    const sup = await cookieFor(await makeUser('supervisor'), t.config);
    expect((await post(sup, `/api/items/${unit}/reentry`, { stage: 'run-test', reason: 'Run again' })).status).toBe(
      200,
    );
    const resultsBefore = (await get(cookies.operator, `/api/items/${unit}/results`)).body.length as number;
    const res = await post(cookies.operator, '/api/results', {
      idempotencyKey: randomUUID(),
      serial: unit,
      station: 'RT-1',
      gauge: 'PG-011',
      gauges: { torque: 'TW-031' },
      readings: [
        { characteristic: 'oil-pressure-idle', value: 20, unit: 'psi' },
        { characteristic: 'oil-pressure-2500', value: 45, unit: 'psi' },
        ...[80, 80, 79, 80, 79, 80].map((v, i) => ({
          characteristic: 'compression',
          position: `c${i + 1}`,
          value: v,
          unit: 'psi',
        })),
        { characteristic: 'leak-free', passed: true },
        { characteristic: 'noise-free', passed: true },
      ],
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields['gauges.torque']).toMatch(/no torque/i);
    expect((await get(cookies.operator, `/api/items/${unit}/results`)).body).toHaveLength(resultsBefore);
  });

  it('when an NCR is raised by a failing result, then its timeline names the stage and time, not a row number', async () => {
    const parts = await tornDownCore(t, cookies, 'TARN-6');
    await pass(t, cookies.operator, 'CLN-1', parts.block);
    const res = await post(cookies.operator, '/api/results', {
      idempotencyKey: randomUUID(),
      serial: parts.block,
      station: 'MPI-1',
      readings: [{ characteristic: 'crack-free', passed: false, location: 'Main web 2' }],
    });
    const ncr = await get(quality, `/api/ncrs/${res.body.nonconformance.number}`);
    const raised = ncr.body.timeline[0].reason as string;
    expect(raised).not.toContain(String(res.body.id));
    expect(raised).toMatch(/Block crack test/);
  });
});
