import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nominalSizeClasses, passingReadings } from '../../db/seeders/sample-readings.js';
import { AuditEvent, Item, Qualification, Signature, StageResult } from '../../server/models/index.js';
import { cookieFor, makeTestApp, makeUser, qualify, TEST_PASSWORD, type TestApp } from '../support/app.js';
import { formFor, gaugesOf, plantToday, tornDownCore } from '../support/parts.js';

let t: TestApp;
let receiving: string;
let operator: string;
let supervisor: string;
let supervisorId: number;

beforeAll(async () => {
  t = makeTestApp();
  receiving = await cookieFor(await makeUser('receiving'), t.config);
  operator = await cookieFor(await makeUser('operator'), t.config);
  const sup = await makeUser('supervisor');
  supervisorId = sup.id;
  supervisor = await cookieFor(sup, t.config);
});
afterAll(() => t.close());

const day = (n: number) =>
  new Date(Date.parse(`${plantToday()}T00:00:00Z`) + n * 86_400_000).toISOString().slice(0, 10);

/** A fresh block due at its first stage (block-clean, station CLN-1). */
async function blockAtClean() {
  return (await tornDownCore(t, { receiving, operator }, 'TARN-6')).block;
}

async function record(cookie: string, serial: string, station = 'CLN-1') {
  const form = await formFor(t, operator, station, serial);
  return request(t.app)
    .post('/api/results')
    .set('Cookie', cookie)
    .send({
      idempotencyKey: randomUUID(),
      serial,
      station,
      ...gaugesOf(form),
      readings: passingReadings(form),
      sizeClasses: nominalSizeClasses(form),
    });
}

async function resultsOf(serial: string) {
  const item = (await Item.findOne({ where: { serial } }))!;
  return StageResult.count({ where: { itemId: item.id } });
}

describe('refusal at the station', () => {
  it('when an operator has no sign-off for the stage, then the result is refused with a plain message and nothing is stored', async () => {
    const raw = await makeUser('operator', { name: 'Nell Untrained', qualified: false });
    const serial = await blockAtClean();
    const res = await record(await cookieFor(raw, t.config), serial);
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('not_qualified');
    expect(res.body.error.message).toBe(
      'Nell Untrained is not qualified to record Block clean: no sign-off is on file. A supervisor can sign one off. Nothing was recorded.',
    );
    expect(await resultsOf(serial)).toBe(0);
  });

  it('when the qualification expired yesterday, then the result is refused naming the expiry day', async () => {
    const lapsed = await makeUser('operator', { name: 'Lars Lapsed', qualified: false });
    await qualify(lapsed, { stages: ['block-clean'], trainedOn: day(-400), expiresOn: day(-1) });
    const serial = await blockAtClean();
    const res = await record(await cookieFor(lapsed, t.config), serial);
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('not_qualified');
    expect(res.body.error.message).toContain(`expired on ${day(-1)}`);
    expect(await resultsOf(serial)).toBe(0);
  });

  it('when the qualification runs out today, then today is still covered (the expiry day is the last day)', async () => {
    const last = await makeUser('operator', { qualified: false });
    await qualify(last, { stages: ['block-clean'], trainedOn: day(-365), expiresOn: day(0) });
    const res = await record(await cookieFor(last, t.config), await blockAtClean());
    expect(res.status).toBe(201);
  });

  it('when an operator is qualified for another stage only, then this stage is refused', async () => {
    const other = await makeUser('operator', { qualified: false });
    await qualify(other, { stages: ['block-crack'] });
    const res = await record(await cookieFor(other, t.config), await blockAtClean());
    expect(res.status).toBe(403);
    expect(res.body.error.message).toContain('Block clean');
  });
});

describe('signing off and withdrawing', () => {
  it('when a supervisor signs an operator off with a password, then the signature, the audit event and the matrix say so, and the operator may record', async () => {
    const person = await makeUser('operator', { name: 'Tam Newstart', qualified: false });
    const res = await request(t.app)
      .post('/api/qualifications')
      .set('Cookie', supervisor)
      .send({
        userId: person.id,
        stage: 'block-clean',
        trainedOn: day(-2),
        expiresOn: day(180),
        reason: 'Thermal clean training, oven SOP rev C',
        password: TEST_PASSWORD,
      });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      person: { id: person.id, name: 'Tam Newstart' },
      stage: { code: 'block-clean' },
      trainedOn: day(-2),
      expiresOn: day(180),
      state: 'current',
      signature: { printedName: 'Test supervisor', reason: 'Thermal clean training, oven SOP rev C' },
    });
    expect(res.body.signature.meaning).toBe(`Qualified to record Block clean until ${day(180)}`);
    const signature = await Signature.findOne({
      where: { entity: 'qualification', entityId: `${person.id}:block-clean` },
    });
    expect(signature!.userId).toBe(supervisorId);
    const event = await AuditEvent.findOne({
      where: { action: 'qualification.signed', entityId: String(res.body.id) },
    });
    expect(event!.actorId).toBe(supervisorId);
    expect(event!.after).toMatchObject({ person: person.id, stage: 'block-clean', expiresOn: day(180) });

    const matrix = await request(t.app).get('/api/qualifications').set('Cookie', supervisor);
    expect(matrix.status).toBe(200);
    const row = matrix.body.people.find((p: { id: number }) => p.id === person.id);
    expect(row.cells['block-clean'].state).toBe('current');
    expect(row.cells['block-crack']).toBeUndefined();

    expect((await record(await cookieFor(person, t.config), await blockAtClean())).status).toBe(201);
  });

  it('when the password is wrong, then nothing is signed off', async () => {
    const person = await makeUser('operator', { qualified: false });
    const res = await request(t.app)
      .post('/api/qualifications')
      .set('Cookie', supervisor)
      .send({
        userId: person.id,
        stage: 'block-clean',
        trainedOn: day(-1),
        expiresOn: day(30),
        reason: 'Training',
        password: 'not the password at all',
      });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('signature_refused');
    expect(await Qualification.count({ where: { userId: person.id } })).toBe(0);
  });

  it('when the dates are the wrong way round, in the future or already past, then each is refused as bad input', async () => {
    const person = await makeUser('operator', { qualified: false });
    const base = { userId: person.id, stage: 'block-clean', reason: 'Training', password: TEST_PASSWORD };
    const cases = [
      { trainedOn: day(5), expiresOn: day(1), field: 'expiresOn' },
      { trainedOn: day(3), expiresOn: day(100), field: 'trainedOn' },
      { trainedOn: day(-100), expiresOn: day(-2), field: 'expiresOn' },
    ];
    for (const c of cases) {
      const res = await request(t.app)
        .post('/api/qualifications')
        .set('Cookie', supervisor)
        .send({ ...base, trainedOn: c.trainedOn, expiresOn: c.expiresOn });
      expect(res.status, JSON.stringify(c)).toBe(400);
      expect(res.body.error.fields).toHaveProperty(c.field);
    }
    const self = await request(t.app)
      .post('/api/qualifications')
      .set('Cookie', supervisor)
      .send({
        ...base,
        userId: supervisorId,
        trainedOn: day(-1),
        expiresOn: day(30),
      });
    expect(self.status).toBe(400);
    expect(self.body.error.message).toBe('Someone else must sign off your own qualification.');
    expect(await Qualification.count({ where: { userId: person.id } })).toBe(0);
  });

  it('when a qualification is withdrawn, then the operator is refused and the row stays with who and why', async () => {
    const person = await makeUser('operator', { name: 'Wyn Withdrawn', qualified: false });
    const signed = await request(t.app)
      .post('/api/qualifications')
      .set('Cookie', supervisor)
      .send({
        userId: person.id,
        stage: 'block-clean',
        trainedOn: day(-10),
        expiresOn: day(100),
        reason: 'Training',
        password: TEST_PASSWORD,
      });
    const res = await request(t.app)
      .post(`/api/qualifications/${signed.body.id}/withdraw`)
      .set('Cookie', supervisor)
      .send({ reason: 'Oven procedure changed; retraining', password: TEST_PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body.state).toBe('withdrawn');
    const q = await Qualification.findByPk(signed.body.id);
    expect(q!.withdrawnById).toBe(supervisorId);
    const refused = await record(await cookieFor(person, t.config), await blockAtClean());
    expect(refused.status).toBe(403);
    expect(refused.body.error.message).toContain('Wyn Withdrawn’s qualification'.replace('’', "'"));
    const again = await request(t.app)
      .post(`/api/qualifications/${signed.body.id}/withdraw`)
      .set('Cookie', supervisor)
      .send({ reason: 'Twice', password: TEST_PASSWORD });
    expect(again.status).toBe(409);
  });

  it('when an operator asks for the matrix or signs someone off, then it is forbidden', async () => {
    expect((await request(t.app).get('/api/qualifications').set('Cookie', operator)).status).toBe(403);
    const res = await request(t.app).post('/api/qualifications').set('Cookie', operator).send({});
    expect(res.status).toBe(403);
  });
});

describe('expiring soon', () => {
  it('when a qualification runs out within the window, then the supervisors’ list shows it soonest first, and not one far off', async () => {
    const soon = await makeUser('operator', { name: 'Sol Soon', qualified: false });
    await qualify(soon, { stages: ['block-crack'], trainedOn: day(-300), expiresOn: day(3) });
    await qualify(soon, { stages: ['block-clean'], trainedOn: day(-300), expiresOn: day(200) });
    const res = await request(t.app).get('/api/qualifications/expiring').query({ days: 30 }).set('Cookie', supervisor);
    expect(res.status).toBe(200);
    const mine = res.body.filter((q: { person: { id: number } }) => q.person.id === soon.id);
    expect(mine.map((q: { stage: { code: string }; state: string }) => [q.stage.code, q.state])).toEqual([
      ['block-crack', 'expiring'],
    ]);
    // sorted by expiry day: nothing listed runs out before the one before it
    const days = res.body.map((q: { expiresOn: string }) => q.expiresOn);
    expect([...days].sort()).toEqual(days);
  });

  it('when a renewal is signed, then the newest row is the one in force', async () => {
    const person = await makeUser('operator', { qualified: false });
    await qualify(person, { stages: ['block-clean'], trainedOn: day(-400), expiresOn: day(-5) });
    await qualify(person, { stages: ['block-clean'], trainedOn: day(-1), expiresOn: day(300) });
    expect((await record(await cookieFor(person, t.config), await blockAtClean())).status).toBe(201);
  });
});
