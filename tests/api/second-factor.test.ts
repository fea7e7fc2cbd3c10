import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, RecoveryCode, User } from '../../server/models/index.js';
import { totpCode } from '../../server/auth/totp.js';
import { TEST_PASSWORD, cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';

let t: TestApp;
beforeAll(() => {
  t = makeTestApp();
});
afterAll(() => t.close());

const login = (body: object) => request(t.app).post('/api/auth/login').send(body);
const cookieOf = (res: request.Response) => (res.headers['set-cookie'] as unknown as string[])[0]!.split(';')[0]!;

/** Enrols through the API as a person would: start, read the secret, answer with the phone's code. */
async function enrol(cookie: string) {
  const start = await request(t.app).post('/api/auth/second-factor/start').set('Cookie', cookie).send({});
  expect(start.status).toBe(200);
  expect(start.body.qrSvg).toMatch(/^<svg/);
  expect(start.body.uri).toContain(`secret=${start.body.secret}`);
  const confirm = await request(t.app)
    .post('/api/auth/second-factor/confirm')
    .set('Cookie', cookie)
    .send({ code: totpCode(start.body.secret as string) });
  expect(confirm.status).toBe(200);
  return { secret: start.body.secret as string, recoveryCodes: confirm.body.recoveryCodes as string[] };
}

describe('a second factor for admins', () => {
  it('when an admin without a second factor signs in, then the session reaches enrolment and nothing else', async () => {
    const admin = await makeUser('admin');
    const res = await login({ email: admin.email, password: TEST_PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body.secondFactor).toEqual({ enrolled: false, required: true });
    const cookie = cookieOf(res);
    const people = await request(t.app).get('/api/people').set('Cookie', cookie);
    expect(people.status).toBe(403);
    expect(people.body.error.code).toBe('second_factor_required');
    expect((await request(t.app).get('/api/auth/me').set('Cookie', cookie)).status).toBe(200);
    // once enrolled, the same session is a full one
    await enrol(cookie);
    expect((await request(t.app).get('/api/people').set('Cookie', cookie)).status).toBe(200);
  });

  it('when an enrolled person signs in, then the code is asked for, a wrong one refused and a right one accepted once', async () => {
    const admin = await makeUser('admin');
    const { secret } = await enrol(cookieOf(await login({ email: admin.email, password: TEST_PASSWORD })));
    const noCode = await login({ email: admin.email, password: TEST_PASSWORD });
    expect(noCode.status).toBe(401);
    expect(noCode.body.error.code).toBe('code_required');
    expect(noCode.headers['set-cookie']).toBeUndefined();
    const wrong = await login({ email: admin.email, password: TEST_PASSWORD, code: '000000' });
    expect(wrong.status).toBe(401);
    expect(wrong.body.error.code).toBe('code_refused');
    expect(wrong.body.error.message).toMatch(/code is not right/);
    // a code from the step after this one: the one just used for enrolment cannot be replayed
    const code = totpCode(secret, Date.now() + 30_000);
    const right = await login({ email: admin.email, password: TEST_PASSWORD, code });
    expect(right.status).toBe(200);
    expect(right.body.secondFactor).toEqual({ enrolled: true, required: true });
    const replay = await login({ email: admin.email, password: TEST_PASSWORD, code });
    expect(replay.status).toBe(401);
  });

  it('when the phone is lost, then each recovery code signs in once, and they are stored hashed', async () => {
    const quality = await makeUser('quality');
    const { recoveryCodes } = await enrol(cookieOf(await login({ email: quality.email, password: TEST_PASSWORD })));
    expect(recoveryCodes).toHaveLength(10);
    const stored = await RecoveryCode.findAll({ where: { userId: quality.id } });
    expect(stored).toHaveLength(10);
    for (const r of stored) expect(recoveryCodes).not.toContain(r.codeHash);
    const first = await login({ email: quality.email, password: TEST_PASSWORD, code: recoveryCodes[0] });
    expect(first.status).toBe(200);
    const again = await login({ email: quality.email, password: TEST_PASSWORD, code: recoveryCodes[0] });
    expect(again.status).toBe(401);
    const events = await AuditEvent.findAll({ where: { entity: 'user', entityId: String(quality.id) } });
    expect(events.map((e) => e.action)).toEqual(
      expect.arrayContaining(['user.second_factor_enrolled', 'user.recovery_code_used']),
    );
  });

  it('when someone other than an admin has no second factor, then they sign in with the password alone', async () => {
    const operator = await makeUser('operator');
    const res = await login({ email: operator.email, password: TEST_PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body.secondFactor).toEqual({ enrolled: false, required: false });
  });

  it('when an admin resets a person’s second factor, then they sign in without a code and it is audited', async () => {
    const admin = await cookieFor(await makeUser('admin'), t.config);
    const quality = await makeUser('quality');
    await enrol(cookieOf(await login({ email: quality.email, password: TEST_PASSWORD })));
    expect((await login({ email: quality.email, password: TEST_PASSWORD })).status).toBe(401);
    const reset = await request(t.app)
      .post(`/api/people/${quality.id}/second-factor/reset`)
      .set('Cookie', admin)
      .send({});
    expect(reset.status).toBe(204);
    expect((await login({ email: quality.email, password: TEST_PASSWORD })).status).toBe(200);
    expect(await RecoveryCode.count({ where: { userId: quality.id } })).toBe(0);
    expect(await User.count({ where: { id: quality.id } })).toBe(1);
  });
});
