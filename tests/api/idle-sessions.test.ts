import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, Session } from '../../server/models/index.js';
import { makeTestApp, makeUser, signInCookie, type TestApp } from '../support/app.js';

let t: TestApp;
beforeAll(() => {
  t = makeTestApp();
});
afterAll(() => t.close());

const me = (cookie: string) => request(t.app).get('/api/auth/me').set('Cookie', cookie);
const sidOf = (cookie: string) =>
  JSON.parse(Buffer.from(cookie.split('=')[1]!.split('.')[1]!, 'base64url').toString()).sid as string;
const idleFor = (cookie: string, minutes: number) =>
  Session.update({ lastSeenAt: new Date(Date.now() - minutes * 60_000) }, { where: { id: sidOf(cookie) } });

describe('idle sessions end', () => {
  it('when an office session sits idle past 30 minutes, then it counts as signed out', async () => {
    const cookie = await signInCookie(t, (await makeUser('quality')).email);
    await idleFor(cookie, 29);
    expect((await me(cookie)).status).toBe(200);
    await idleFor(cookie, 31);
    expect((await me(cookie)).status).toBe(401);
  });

  it('when a floor session sits idle for less than a shift, then it lives on; past the shift it ends', async () => {
    const cookie = await signInCookie(t, (await makeUser('operator')).email);
    await idleFor(cookie, 120);
    expect((await me(cookie)).status).toBe(200);
    await idleFor(cookie, 8 * 60 + 1);
    expect((await me(cookie)).status).toBe(401);
  });
});

describe('your own sessions', () => {
  it('when a person lists their sessions and signs out everywhere else, then only this one is left', async () => {
    const user = await makeUser('supervisor');
    const here = await signInCookie(t, user.email);
    const tablet = await signInCookie(t, user.email);
    const other = await signInCookie(t, (await makeUser('supervisor')).email);
    const list = await request(t.app).get('/api/auth/sessions').set('Cookie', here);
    expect(list.status).toBe(200);
    expect(list.body).toHaveLength(2);
    expect(list.body.filter((s: { current: boolean }) => s.current)).toHaveLength(1);
    const end = await request(t.app).post('/api/auth/sessions/end-others').set('Cookie', here).send({});
    expect(end.status).toBe(200);
    expect(end.body).toEqual({ ended: 1 });
    expect((await me(here)).status).toBe(200);
    expect((await me(tablet)).status).toBe(401);
    expect((await me(other)).status).toBe(200);
    expect(await AuditEvent.count({ where: { action: 'user.sessions_ended', entityId: String(user.id) } })).toBe(1);
  });
});
