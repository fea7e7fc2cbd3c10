import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, DefectCode, User } from '../../server/models/index.js';
import { hashPassword } from '../../server/services/passwords.js';
import { TEST_PASSWORD, cookieFor, makeTestApp, makeUser, unique, type TestApp } from '../support/app.js';
import { tornDownCore } from '../support/parts.js';

let t: TestApp;
beforeAll(() => {
  t = makeTestApp();
});
afterAll(() => t.close());

const login = (app: TestApp, email: string, password: string) =>
  request(app.app).post('/api/auth/login').send({ email, password });

describe('guessing a password on the change-password and signature routes is limited', () => {
  it('when the current password is guessed wrong too often, then 429 even with the right one', async () => {
    const limited = makeTestApp({ PASSWORD_LIMIT_PER_PERSON: 3 }, t.sequelize);
    try {
      const user = await makeUser('operator');
      const cookie = await cookieFor(user, limited.config);
      const change = (currentPassword: string) =>
        request(limited.app)
          .post('/api/auth/password')
          .set('Cookie', cookie)
          .send({ currentPassword, newPassword: 'a brand new passphrase' });
      for (let i = 0; i < 3; i++) expect((await change(`wrong guess ${i}`)).status).toBe(400);
      const res = await change(TEST_PASSWORD);
      expect(res.status).toBe(429);
      expect(res.body.error.code).toBe('too_many');
      await user.reload();
      expect(user.passwordHash).not.toBe(await hashPassword('a brand new passphrase'));
    } finally {
      await limited.close();
    }
  });

  it('when a signature password is wrong too often, then every signature route answers 429 for that person', async () => {
    const limited = makeTestApp({ PASSWORD_LIMIT_PER_PERSON: 3 }, t.sequelize);
    try {
      const receiving = await cookieFor(await makeUser('receiving'), limited.config);
      const operator = await cookieFor(await makeUser('operator'), limited.config);
      const qualityUser = await makeUser('quality');
      const quality = await cookieFor(qualityUser, limited.config);
      const parts = await tornDownCore(limited, { receiving, operator }, 'TARN-6');
      const code = (await DefectCode.findOne({ where: { active: true } }))!.code;
      const raised = await request(limited.app)
        .post('/api/ncrs')
        .set('Cookie', operator)
        .send({ serial: parts.block, description: 'Deep score in bore four', severity: 'minor', defectCode: code });
      expect(raised.status).toBe(201);
      const number = raised.body.number as string;
      expect(
        (await request(limited.app).post(`/api/ncrs/${number}/review`).set('Cookie', quality).send({})).status,
      ).toBe(200);
      const decide = (password: string) =>
        request(limited.app)
          .post(`/api/ncrs/${number}/disposition`)
          .set('Cookie', quality)
          .send({ disposition: 'scrap', reason: 'Score too deep to bore out', password });
      for (let i = 0; i < 3; i++) {
        const res = await decide(`wrong guess ${i}`);
        expect(res.status).toBe(400);
        expect(res.body.error.code).toBe('signature_refused');
      }
      expect((await decide(TEST_PASSWORD)).status).toBe(429);
      const approve = await request(limited.app)
        .post('/api/spec/rules/987654/approve')
        .set('Cookie', quality)
        .send({ reason: 'Tighter limit', password: TEST_PASSWORD });
      expect(approve.status).toBe(429);
      const countersign = await request(limited.app)
        .post(`/api/ncrs/${number}/countersign`)
        .set('Cookie', quality)
        .send({ reason: 'I agree with it', password: TEST_PASSWORD });
      expect(countersign.status).toBe(429);
    } finally {
      await limited.close();
    }
  });
});

describe('sign-in', () => {
  it('when a password runs past 72 bytes, then sign-in refuses it as setting one does, not by its first 72', async () => {
    const password = 'x'.repeat(72);
    const user = await makeUser('operator');
    await user.update({ passwordHash: await hashPassword(password) });
    expect((await login(t, user.email, password)).status).toBe(200);
    const res = await login(t, user.email, `${password}and anything after`);
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('password');
  });

  it('when eight tablets sign in to one account at once, then all get in and none counts as a failure', async () => {
    const limited = makeTestApp({ LOGIN_LIMIT_PER_ACCOUNT: 5, LOGIN_LIMIT_PER_ADDRESS: 100 }, t.sequelize);
    try {
      const user = await makeUser('operator');
      const replies = await Promise.all(Array.from({ length: 8 }, () => login(limited, user.email, TEST_PASSWORD)));
      expect(replies.map((r) => r.status)).toEqual(Array(8).fill(200));
      // five failures are still allowed before the lock: the eight successes counted for nothing
      for (let i = 0; i < 5; i++) expect((await login(limited, user.email, 'wrong password')).status).toBe(401);
      expect((await login(limited, user.email, TEST_PASSWORD)).status).toBe(429);
    } finally {
      await limited.close();
    }
  });

  it('when an account is locked out, then an admin sees it and lifts it, and the lift is in the audit trail', async () => {
    const limited = makeTestApp({ LOGIN_LIMIT_PER_ACCOUNT: 2, LOGIN_LIMIT_PER_ADDRESS: 100 }, t.sequelize);
    try {
      const user = await makeUser('operator', { name: unique('Locked ') });
      const admin = await cookieFor(await makeUser('admin'), limited.config);
      for (let i = 0; i < 2; i++) expect((await login(limited, user.email, 'wrong password')).status).toBe(401);
      expect((await login(limited, user.email, TEST_PASSWORD)).status).toBe(429);
      const list = await request(limited.app).get('/api/lockouts').set('Cookie', admin);
      expect(list.status).toBe(200);
      const entry = list.body.accounts.find((a: { email: string }) => a.email === user.email);
      expect(entry).toMatchObject({ email: user.email, userId: user.id, name: user.name, failures: 2 });
      const lift = await request(limited.app)
        .post('/api/lockouts/lift')
        .set('Cookie', admin)
        .send({ email: user.email });
      expect(lift.status).toBe(204);
      expect((await login(limited, user.email, TEST_PASSWORD)).status).toBe(200);
      const events = await AuditEvent.findAll({ where: { action: 'user.lockout_lifted', entityId: String(user.id) } });
      expect(events).toHaveLength(1);
      // only an admin may
      const operator = await cookieFor(await makeUser('operator'), limited.config);
      expect((await request(limited.app).get('/api/lockouts').set('Cookie', operator)).status).toBe(403);
      expect(await User.count({ where: { id: user.id, active: true } })).toBe(1);
    } finally {
      await limited.close();
    }
  });
});
