import jwt from 'jsonwebtoken';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { GENERIC_SIGN_IN_FAILURE } from '../../server/services/auth.js';
import { Session } from '../../server/models/index.js';
import { cookieFor, makeTestApp, makeUser, signInCookie, TEST_PASSWORD, type TestApp } from '../support/app.js';

let t: TestApp;
beforeAll(() => {
  t = makeTestApp();
});
afterAll(() => t.close());

const me = (cookie: string) => request(t.app).get('/api/auth/me').set('Cookie', cookie);

describe('sign-in', () => {
  it('when the password is right, then an httpOnly SameSite cookie and the role permissions', async () => {
    const user = await makeUser('quality');
    const res = await request(t.app)
      .post('/api/auth/login')
      .send({ email: user.email.toUpperCase(), password: TEST_PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body.user.role).toBe('quality');
    expect(res.body.permissions).toContain('spec.approve');
    const cookie = (res.headers['set-cookie'] as unknown as string[])[0]!;
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    expect(cookie).not.toMatch(/Secure/i); // plain HTTP here; Secure when served over HTTPS
  });

  it('when the request arrives over HTTPS (behind a loopback proxy), then the cookie is Secure', async () => {
    const user = await makeUser('quality');
    const res = await request(t.app)
      .post('/api/auth/login')
      .set('X-Forwarded-Proto', 'https')
      .send({ email: user.email, password: TEST_PASSWORD });
    expect((res.headers['set-cookie'] as unknown as string[])[0]).toMatch(/Secure/);
  });

  it('when the e-mail is unknown, the password wrong or the account inactive, then the same generic 401', async () => {
    const user = await makeUser('operator');
    const inactive = await makeUser('operator', { active: false });
    const tries = [
      { email: 'nobody-at-all@test.example', password: TEST_PASSWORD },
      { email: user.email, password: 'not the password' },
      { email: inactive.email, password: TEST_PASSWORD },
    ];
    for (const body of tries) {
      const res = await request(t.app).post('/api/auth/login').send(body);
      expect(res.status).toBe(401);
      expect(res.body.error.message).toBe(GENERIC_SIGN_IN_FAILURE);
    }
  });
});

describe('session revocation', () => {
  it('when someone signs out, then that cookie no longer works', async () => {
    const user = await makeUser('receiving');
    const cookie = await signInCookie(t, user.email);
    expect((await me(cookie)).status).toBe(200);
    expect((await request(t.app).post('/api/auth/logout').set('Cookie', cookie)).status).toBe(204);
    expect((await me(cookie)).status).toBe(401);
  });

  it('when an admin deactivates a person, then all their sessions end and they cannot sign in', async () => {
    const admin = await cookieFor(await makeUser('admin'), t.config);
    const user = await makeUser('shipping');
    const a = await cookieFor(user, t.config);
    const b = await signInCookie(t, user.email);
    const res = await request(t.app).patch(`/api/people/${user.id}`).set('Cookie', admin).send({ active: false });
    expect(res.status).toBe(200);
    expect(res.body.active).toBe(false);
    expect((await me(a)).status).toBe(401);
    expect((await me(b)).status).toBe(401);
    const again = await request(t.app).post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD });
    expect(again.status).toBe(401);
  });

  it('when a person changes their password, then every session ends and the new password works', async () => {
    const user = await makeUser('warranty');
    const a = await signInCookie(t, user.email);
    const b = await cookieFor(user, t.config);
    const res = await request(t.app)
      .post('/api/auth/password')
      .set('Cookie', a)
      .send({ currentPassword: TEST_PASSWORD, newPassword: 'a brand new passphrase' });
    expect(res.status).toBe(204);
    expect((await me(a)).status).toBe(401);
    expect((await me(b)).status).toBe(401);
    expect((await me(await signInCookie(t, user.email, 'a brand new passphrase'))).status).toBe(200);
  });

  it('when the current password is wrong, then 400 and nothing changes', async () => {
    const user = await makeUser('warranty');
    const a = await cookieFor(user, t.config);
    const res = await request(t.app)
      .post('/api/auth/password')
      .set('Cookie', a)
      .send({ currentPassword: 'wrong wrong wrong', newPassword: 'a brand new passphrase' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('currentPassword');
    expect((await me(a)).status).toBe(200);
  });

  it("when an admin resets a password, then that person's sessions end", async () => {
    const admin = await cookieFor(await makeUser('admin'), t.config);
    const user = await makeUser('operator');
    const a = await cookieFor(user, t.config);
    const res = await request(t.app)
      .post(`/api/people/${user.id}/password`)
      .set('Cookie', admin)
      .send({ password: 'reset by the admin' });
    expect(res.status).toBe(204);
    expect((await me(a)).status).toBe(401);
    expect((await me(await signInCookie(t, user.email, 'reset by the admin'))).status).toBe(200);
  });

  it('when a token is forged, unsigned, expired or its session is revoked, then it counts as signed out', async () => {
    const user = await makeUser('operator');
    const good = await cookieFor(user, t.config);
    const token = good.split('=')[1]!;
    const claims = jwt.decode(token) as { sid: string; tv: number };
    const forged = jwt.sign({ sid: claims.sid, tv: claims.tv }, 'some other secret that is long enough', {
      algorithm: 'HS256',
      subject: String(user.id),
    });
    const unsigned = jwt.sign({ sid: claims.sid, tv: claims.tv, sub: String(user.id) }, '', { algorithm: 'none' });
    const expired = jwt.sign({ sid: claims.sid, tv: claims.tv }, t.config.JWT_SECRET, {
      algorithm: 'HS256',
      subject: String(user.id),
      expiresIn: -10,
    });
    for (const bad of [forged, unsigned, expired]) {
      expect((await me(`coretrail_session=${bad}`)).status).toBe(401);
    }
    expect((await me(good)).status).toBe(200);
    await Session.update({ revokedAt: new Date() }, { where: { id: claims.sid } });
    expect((await me(good)).status).toBe(401);
  });
});

describe('failed sign-ins are rate limited', () => {
  it('when one account fails too often, then 429 even with the right password', async () => {
    const limited = makeTestApp({ LOGIN_LIMIT_PER_ACCOUNT: 3, LOGIN_LIMIT_PER_ADDRESS: 100 }, t.sequelize);
    try {
      const user = await makeUser('operator');
      for (let i = 0; i < 3; i++) {
        const res = await request(limited.app)
          .post('/api/auth/login')
          .send({ email: user.email, password: 'wrong password' });
        expect(res.status).toBe(401);
      }
      const res = await request(limited.app)
        .post('/api/auth/login')
        .send({ email: user.email, password: TEST_PASSWORD });
      expect(res.status).toBe(429);
      expect(res.body.error.code).toBe('too_many');
      // another account from the same address is not locked by this one
      const other = await makeUser('operator');
      expect(
        (await request(limited.app).post('/api/auth/login').send({ email: other.email, password: TEST_PASSWORD }))
          .status,
      ).toBe(200);
    } finally {
      await limited.close();
    }
  });

  it('when one address fails across many accounts, then 429', async () => {
    const limited = makeTestApp({ LOGIN_LIMIT_PER_ACCOUNT: 100, LOGIN_LIMIT_PER_ADDRESS: 4 }, t.sequelize);
    try {
      for (let i = 0; i < 4; i++) {
        const res = await request(limited.app)
          .post('/api/auth/login')
          .send({ email: `nobody${i}@test.example`, password: 'x' });
        expect(res.status).toBe(401);
      }
      const res = await request(limited.app)
        .post('/api/auth/login')
        .send({ email: 'nobody9@test.example', password: 'x' });
      expect(res.status).toBe(429);
    } finally {
      await limited.close();
    }
  });
});
