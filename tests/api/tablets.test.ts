import { randomUUID } from 'node:crypto';
import bcrypt from 'bcryptjs';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nominalSizeClasses, passingReadings } from '../../db/seeders/sample-readings.js';
import { AuditEvent, Item, StageResult, StationTablet, User } from '../../server/models/index.js';
import { cookieFor, makeTestApp, makeUser, TEST_PASSWORD, unique, type TestApp } from '../support/app.js';
import { formFor, gaugesOf, tornDownCore } from '../support/parts.js';

let t: TestApp;
let admin: string;
let receiving: string;
let operator: string;

beforeAll(async () => {
  t = makeTestApp();
  admin = await cookieFor(await makeUser('admin'), t.config);
  receiving = await cookieFor(await makeUser('receiving'), t.config);
  operator = await cookieFor(await makeUser('operator'), t.config);
});
afterAll(() => t.close());

/** A tablet enrolled to a station by an admin; its cookie is the tablet's own sign-in. */
async function enrol(station = 'CLN-1', label = unique('Tablet ')) {
  const res = await request(t.app).post('/api/tablets').set('Cookie', admin).send({ station, label });
  if (res.status !== 201) throw new Error(`enrol failed: ${res.status} ${JSON.stringify(res.body)}`);
  const cookie = (res.headers['set-cookie'] as unknown as string[])
    .find((c) => c.startsWith('coretrail_tablet='))!
    .split(';')[0]!;
  return { id: res.body.id as number, cookie };
}

/** An operator with a badge and a PIN (hashed at bcrypt's lowest cost: the PIN is not what is timed here). */
async function badged(extra: Parameters<typeof makeUser>[1] = {}) {
  const user = await makeUser('operator', extra);
  const badge = unique('B').toUpperCase();
  const pin = String(100000 + Math.floor(Math.random() * 899999)).slice(0, 6);
  await user.update({ badge, pinHash: await bcrypt.hash(pin, 4) });
  return { user, badge, pin };
}

const blockAtClean = async () => (await tornDownCore(t, { receiving, operator }, 'TARN-6')).block;

async function tabletBody(serial: string, who: { badge: string; pin: string }, station = 'CLN-1') {
  const form = await formFor(t, operator, station, serial);
  return {
    idempotencyKey: randomUUID(),
    serial,
    station,
    ...gaugesOf(form),
    readings: passingReadings(form),
    sizeClasses: nominalSizeClasses(form),
    badge: who.badge,
    pin: who.pin,
  };
}

const resultsOf = async (serial: string) =>
  StageResult.findAll({ where: { itemId: (await Item.findOne({ where: { serial } }))!.id } });

describe('enrolment', () => {
  it('when an admin enrols a tablet, then it gets its own sign-in naming the station, and the trail says who enrolled it', async () => {
    const { id, cookie } = await enrol('CLN-1', 'Clean bay tablet');
    const me = await request(t.app).get('/api/tablet').set('Cookie', cookie);
    expect(me.status).toBe(200);
    expect(me.body).toMatchObject({ id, label: 'Clean bay tablet', station: { code: 'CLN-1' } });
    const event = await AuditEvent.findOne({ where: { action: 'tablet.enrolled', entityId: String(id) } });
    expect(event!.after).toEqual({ station: 'CLN-1', label: 'Clean bay tablet' });
  });

  it('when a supervisor tries to enrol a tablet, then it is forbidden and nothing is enrolled', async () => {
    const sup = await cookieFor(await makeUser('supervisor'), t.config);
    const label = unique('Nope ');
    const res = await request(t.app).post('/api/tablets').set('Cookie', sup).send({ station: 'CLN-1', label });
    expect(res.status).toBe(403);
    expect(await StationTablet.count({ where: { label } })).toBe(0);
  });

  it('when the tablet is retired, then its sign-in ends at once', async () => {
    const { id, cookie } = await enrol();
    expect((await request(t.app).post(`/api/tablets/${id}/retire`).set('Cookie', admin)).status).toBe(200);
    const res = await request(t.app).get('/api/tablet').set('Cookie', cookie);
    expect(res.status).toBe(401);
  });

  it('when a person’s session calls a tablet route, or a forged tablet cookie does, then it is 401', async () => {
    expect((await request(t.app).get('/api/tablet').set('Cookie', operator)).status).toBe(401);
    const forged = operator.replace('coretrail_session=', 'coretrail_tablet=');
    expect((await request(t.app).get('/api/tablet').set('Cookie', forged)).status).toBe(401);
  });
});

describe('recording on a shared tablet', () => {
  it('when only the tablet is signed in, then it cannot record: the operator route is 401 and the tablet route wants a badge and PIN', async () => {
    const { cookie } = await enrol();
    const serial = await blockAtClean();
    const { badge: _b, pin: _p, ...body } = await tabletBody(serial, { badge: 'X', pin: '0' });
    expect((await request(t.app).post('/api/results').set('Cookie', cookie).send(body)).status).toBe(401);
    const res = await request(t.app).post('/api/tablet/results').set('Cookie', cookie).send(body);
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toEqual(expect.arrayContaining(['badge', 'pin']));
    expect(await resultsOf(serial)).toHaveLength(0);
  });

  it('when two operators take turns on one tablet, then each result is stored under the person who identified, with the tablet beside them', async () => {
    const { id, cookie } = await enrol('CLN-1', 'Shared clean tablet');
    const ana = await badged({ name: 'Ana Turner' });
    const ben = await badged({ name: 'Ben Ortiz' });
    const [first, second, third] = [await blockAtClean(), await blockAtClean(), await blockAtClean()];
    const turns: [string, typeof ana][] = [
      [first, ana],
      [second, ben],
      [third, ana],
    ];
    for (const [serial, who] of turns) {
      const res = await request(t.app)
        .post('/api/tablet/results')
        .set('Cookie', cookie)
        .send(await tabletBody(serial, who));
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      expect(res.body.operator).toBe(who.user.name);
    }
    for (const [serial, who] of turns) {
      const [r] = await resultsOf(serial);
      expect(r!.operatorId).toBe(who.user.id);
      expect(r!.tabletId).toBe(id);
      const event = await AuditEvent.findOne({ where: { action: 'result.recorded', entityId: String(r!.id) } });
      expect(event!.actorId).toBe(who.user.id);
      expect(event!.after).toMatchObject({ tablet: { id, label: 'Shared clean tablet' }, station: 'CLN-1' });
    }
  });

  it('when the body names another station than the tablet’s, then it is refused', async () => {
    const { cookie } = await enrol('CLN-1');
    const who = await badged();
    const serial = await blockAtClean();
    const body = { ...(await tabletBody(serial, who)), station: 'MPI-1' };
    const res = await request(t.app).post('/api/tablet/results').set('Cookie', cookie).send(body);
    expect(res.status).toBe(400);
    expect(res.body.error.message).toBe('This tablet records CLN-1 only.');
    expect(await resultsOf(serial)).toHaveLength(0);
  });

  it('when the badge holder is not qualified for the stage, then the tablet refuses with the plain message', async () => {
    const { cookie } = await enrol('CLN-1');
    const who = await badged({ name: 'Una Qualified', qualified: false });
    const serial = await blockAtClean();
    const res = await request(t.app)
      .post('/api/tablet/results')
      .set('Cookie', cookie)
      .send(await tabletBody(serial, who));
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('not_qualified');
    expect(res.body.error.message).toContain('Una Qualified is not qualified to record Block clean');
    expect(await resultsOf(serial)).toHaveLength(0);
  });
});

describe('PIN guessing', () => {
  it('when a badge gets five wrong PINs, then the sixth try is 429 even with the right PIN, another badge on the tablet still works, and nothing is stored', async () => {
    // the limit: 5 per badge in 15 minutes (server/services/tablets.ts, common practice for short PINs)
    const { cookie } = await enrol('CLN-1');
    const who = await badged();
    const other = await badged();
    const serial = await blockAtClean();
    const wrongPin = who.pin === '000000' ? '111111' : '000000';
    for (let i = 0; i < 5; i++) {
      const res = await request(t.app)
        .post('/api/tablet/results')
        .set('Cookie', cookie)
        .send(await tabletBody(serial, { badge: who.badge, pin: wrongPin }));
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('pin_refused');
    }
    const locked = await request(t.app)
      .post('/api/tablet/results')
      .set('Cookie', cookie)
      .send(await tabletBody(serial, who));
    expect(locked.status).toBe(429);
    expect(await resultsOf(serial)).toHaveLength(0);
    const ok = await request(t.app)
      .post('/api/tablet/results')
      .set('Cookie', cookie)
      .send(await tabletBody(serial, other));
    expect(ok.status).toBe(201);
  });

  it('when an unknown badge, a wrong PIN and a person with no PIN are tried, then each gets the same refusal', async () => {
    const { cookie } = await enrol('CLN-1');
    const who = await badged();
    const noPin = await makeUser('operator');
    const noPinBadge = unique('N').toUpperCase();
    await noPin.update({ badge: noPinBadge });
    const serial = await blockAtClean();
    const replies = [];
    for (const attempt of [
      { badge: unique('U').toUpperCase(), pin: '482915' },
      { badge: who.badge, pin: who.pin === '482915' ? '482916' : '482915' },
      { badge: noPinBadge, pin: '482915' },
    ]) {
      const res = await request(t.app)
        .post('/api/tablet/results')
        .set('Cookie', cookie)
        .send(await tabletBody(serial, attempt));
      replies.push([res.status, res.body.error.code, res.body.error.message]);
    }
    expect(new Set(replies.map((r) => JSON.stringify(r))).size).toBe(1);
    expect(replies[0]![0]).toBe(400);
  });

  it('when twenty wrong PINs arrive on one tablet across badges, then the tablet waits', async () => {
    const { cookie } = await enrol('CLN-1');
    const who = await badged();
    const serial = await blockAtClean();
    // one form read for all twenty tries: each unknown badge still costs a bcrypt compare at cost 12
    const body = await tabletBody(serial, who);
    for (let i = 0; i < 20; i++) {
      const res = await request(t.app)
        .post('/api/tablet/results')
        .set('Cookie', cookie)
        .send({ ...body, badge: unique('G').toUpperCase(), pin: '482915' });
      expect(res.status).toBe(400);
    }
    const res = await request(t.app)
      .post('/api/tablet/results')
      .set('Cookie', cookie)
      .send(await tabletBody(serial, who));
    expect(res.status).toBe(429);
  }, 90_000);
});

describe('badges and PINs', () => {
  it('when a person sets a PIN with their password, then only its bcrypt hash is kept and the trail never holds it', async () => {
    const user = await makeUser('operator');
    const cookie = await cookieFor(user, t.config);
    const wrong = await request(t.app)
      .put('/api/auth/pin')
      .set('Cookie', cookie)
      .send({ pin: '583920', password: 'nope nope nope' });
    expect(wrong.status).toBe(400);
    const run = await request(t.app)
      .put('/api/auth/pin')
      .set('Cookie', cookie)
      .send({ pin: '1234', password: TEST_PASSWORD });
    expect(run.status).toBe(400);
    const ok = await request(t.app)
      .put('/api/auth/pin')
      .set('Cookie', cookie)
      .send({ pin: '583920', password: TEST_PASSWORD });
    expect(ok.status).toBe(204);
    const row = (await User.findByPk(user.id))!;
    expect(row.pinHash).toMatch(/^\$2[aby]\$/);
    expect(await bcrypt.compare('583920', row.pinHash!)).toBe(true);
    const event = await AuditEvent.findOne({ where: { action: 'user.pin_set', entityId: String(user.id) } });
    expect(JSON.stringify(event)).not.toContain('583920');
  });

  it('when an admin gives a second person a badge already in use, then 409 and the badge stays with its holder', async () => {
    const a = await makeUser('operator');
    const b = await makeUser('operator');
    const badge = unique('K').toUpperCase();
    expect((await request(t.app).put(`/api/people/${a.id}/badge`).set('Cookie', admin).send({ badge })).status).toBe(
      204,
    );
    const res = await request(t.app).put(`/api/people/${b.id}/badge`).set('Cookie', admin).send({ badge });
    expect(res.status).toBe(409);
    expect((await User.findByPk(a.id))!.badge).toBe(badge);
    expect((await User.findByPk(b.id))!.badge).toBeNull();
  });
});
