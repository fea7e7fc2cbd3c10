import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, User } from '../../server/models/index.js';
import { cookieFor, makeTestApp, makeUser, unique, type TestApp } from '../support/app.js';

let t: TestApp;
let admin: string;

beforeAll(async () => {
  t = makeTestApp();
  admin = await cookieFor(await makeUser('admin'), t.config);
});
afterAll(() => t.close());

const goodPerson = () => ({
  email: `${unique('p')}@test.example`,
  name: 'Pat Example',
  role: 'operator',
  password: 'twelve chars ok',
});

async function nothingWritten(email: string) {
  expect(await User.count({ where: { email } })).toBe(0);
}

describe('bad input gets a clear 4xx and writes nothing', () => {
  it('when the JSON is malformed, then 400 malformed_json', async () => {
    const res = await request(t.app)
      .post('/api/people')
      .set('Cookie', admin)
      .set('Content-Type', 'application/json')
      .send('{"email": "a@b.example", "name": ');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('malformed_json');
  });

  it('when fields have the wrong type, then 400 names each field', async () => {
    const body = { ...goodPerson(), name: 42, role: ['admin'] };
    const res = await request(t.app).post('/api/people').set('Cookie', admin).send(body);
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['name', 'role']);
    await nothingWritten(body.email);
  });

  it('when a field is unknown, then 400 names it', async () => {
    const body = { ...goodPerson(), isSuperuser: true };
    const res = await request(t.app).post('/api/people').set('Cookie', admin).send(body);
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({ isSuperuser: 'This field is not allowed.' });
    await nothingWritten(body.email);
  });

  it('when the body is over the size limit, then 413', async () => {
    const body = { ...goodPerson(), name: 'x'.repeat(300_000) };
    const res = await request(t.app).post('/api/people').set('Cookie', admin).send(body);
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('too_large');
    await nothingWritten(body.email);
  });

  it('when a password is under 12 characters or over 72 bytes, then 400 on password', async () => {
    for (const password of ['elevenchars', 'é'.repeat(37)]) {
      const body = { ...goodPerson(), password };
      const res = await request(t.app).post('/api/people').set('Cookie', admin).send(body);
      expect(res.status).toBe(400);
      expect(Object.keys(res.body.error.fields)).toEqual(['password']);
      await nothingWritten(body.email);
    }
  });

  it('when a query or route parameter is wrong, then 400 names it', async () => {
    let res = await request(t.app).get('/api/people?page=first').set('Cookie', admin);
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('page');
    res = await request(t.app).get('/api/people?sortBy=salary').set('Cookie', admin);
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('sortBy');
    res = await request(t.app).patch('/api/people/abc').set('Cookie', admin).send({ name: 'New Name' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('id');
  });

  it('when the e-mail is already taken, then 409 and no audit event', async () => {
    const body = goodPerson();
    expect((await request(t.app).post('/api/people').set('Cookie', admin).send(body)).status).toBe(201);
    const res = await request(t.app)
      .post('/api/people')
      .set('Cookie', admin)
      .send({ ...body, name: 'Someone Else' });
    expect(res.status).toBe(409);
    expect(res.body.error.fields).toHaveProperty('email');
    expect(await User.count({ where: { email: body.email } })).toBe(1);
    // other suites may create users meanwhile, but none with this e-mail
    const events = await AuditEvent.findAll({ where: { entity: 'user', action: 'user.created' } });
    expect(events.filter((e) => (e.after as { email?: string })?.email === body.email)).toHaveLength(1);
  });

  it('when a station names an unknown stage, then 400 and no station', async () => {
    const code = unique('S').toUpperCase().slice(0, 10);
    const res = await request(t.app)
      .post('/api/stations')
      .set('Cookie', admin)
      .send({ code, name: 'Somewhere', stageCode: 'no-such-stage' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({ stageCode: 'Unknown stage.' });
    const list = await request(t.app).get('/api/stations').set('Cookie', admin);
    expect(list.body.map((s: { code: string }) => s.code)).not.toContain(code);
  });

  it('when an engine family is inconsistent, then 400 on the field', async () => {
    const res = await request(t.app)
      .post('/api/engine-families')
      .set('Cookie', admin)
      .send({
        code: unique('F').toUpperCase().slice(0, 10),
        name: 'Odd V',
        layout: 'v',
        cylinders: 7,
        boreMm: 90,
        strokeMm: 90,
        headsPerEngine: 2,
        warrantyMonths: 12,
        warrantyKm: null,
      });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('cylinders');
  });
});
