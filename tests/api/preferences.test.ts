import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, User } from '../../server/models/index.js';
import { cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';

let t: TestApp;

beforeAll(() => {
  t = makeTestApp();
});
afterAll(() => t.close());

describe('a person’s language and unit system', () => {
  it('when someone signs in for the first time, then their screens speak English in inches', async () => {
    const user = await makeUser('operator');
    const me = await request(t.app)
      .get('/api/auth/me')
      .set('Cookie', await cookieFor(user, t.config));
    expect(me.status).toBe(200);
    expect(me.body.user).toMatchObject({ language: 'en', unitSystem: 'inch' });
  });

  it('when an operator chooses Spanish and metric, then it is kept on their profile, audited, and /me says so', async () => {
    const user = await makeUser('operator');
    const cookie = await cookieFor(user, t.config);
    const res = await request(t.app)
      .patch('/api/auth/preferences')
      .set('Cookie', cookie)
      .send({ language: 'es', unitSystem: 'metric' });
    expect(res.status).toBe(200);
    expect(res.body.user).toMatchObject({ id: user.id, language: 'es', unitSystem: 'metric' });
    await user.reload();
    expect([user.language, user.unitSystem]).toEqual(['es', 'metric']);
    const event = await AuditEvent.findOne({
      where: { action: 'user.preferences_changed', entityId: String(user.id) },
    });
    expect(event?.before).toEqual({ language: 'en', unitSystem: 'inch' });
    expect(event?.after).toEqual({ language: 'es', unitSystem: 'metric' });
  });

  it('when the body names an unknown language, an unknown key or nothing at all, then 400 and nothing changes', async () => {
    const user = await makeUser('operator');
    const cookie = await cookieFor(user, t.config);
    for (const body of [{ language: 'fr' }, { unitSystem: 'furlong' }, { language: 'es', theme: 'dark' }, {}]) {
      const res = await request(t.app).patch('/api/auth/preferences').set('Cookie', cookie).send(body);
      expect(res.status).toBe(400);
    }
    const row = (await User.findByPk(user.id))!;
    expect([row.language, row.unitSystem]).toEqual(['en', 'inch']);
  });

  it('when nobody is signed in, then 401', async () => {
    const res = await request(t.app).patch('/api/auth/preferences').send({ language: 'es' });
    expect(res.status).toBe(401);
  });
});
