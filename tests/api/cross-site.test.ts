import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../../server/models/index.js';
import { cookieFor, makeTestApp, makeUser, unique, type TestApp } from '../support/app.js';

let t: TestApp;
beforeAll(() => {
  t = makeTestApp();
});
afterAll(() => t.close());

const me = (cookie: string) => request(t.app).get('/api/auth/me').set('Cookie', cookie);

describe('writes are JSON only', () => {
  it('when sign-out arrives as a text or form post, then 415 and the session lives on', async () => {
    const cookie = await cookieFor(await makeUser('operator'), t.config);
    for (const type of ['text/plain', 'application/x-www-form-urlencoded', 'multipart/form-data; boundary=x']) {
      const requestId = unique('xsite-');
      const res = await request(t.app)
        .post('/api/auth/logout')
        .set('Cookie', cookie)
        .set('X-Request-Id', requestId)
        .set('Content-Type', type)
        .send('a=b');
      expect(res.status, type).toBe(415);
      expect(res.body.error.code, type).toBe('unsupported_media_type');
      expect(await AuditEvent.count({ where: { requestId } })).toBe(0);
    }
    expect((await me(cookie)).status).toBe(200);
  });

  it('when an NCR review, close or a draft discard arrives as a form post, then 415', async () => {
    const quality = await cookieFor(await makeUser('quality'), t.config);
    for (const url of [
      '/api/ncrs/NC-2026-00001/review',
      '/api/ncrs/NC-2026-00001/close',
      '/api/spec/rules/1/discard',
    ]) {
      const res = await request(t.app)
        .post(url)
        .set('Cookie', quality)
        .set('Content-Type', 'application/x-www-form-urlencoded')
        .send('note=hello');
      expect(res.status, url).toBe(415);
    }
  });
});

describe('writes come from the product’s own origin', () => {
  it('when another site (another port, a sibling host) posts with the cookie, then 403 cross_site', async () => {
    const cookie = await cookieFor(await makeUser('operator'), t.config);
    const tries: Record<string, string>[] = [
      { Origin: 'http://127.0.0.1:9999' },
      { Origin: 'http://evil.example' },
      { Origin: 'null' },
      { 'Sec-Fetch-Site': 'same-site' },
      { 'Sec-Fetch-Site': 'cross-site' },
    ];
    for (const headers of tries) {
      const res = await request(t.app).post('/api/auth/logout').set('Cookie', cookie).set(headers).send({});
      expect(res.status, JSON.stringify(headers)).toBe(403);
      expect(res.body.error.code).toBe('cross_site');
    }
    expect((await me(cookie)).status).toBe(200);
  });

  it('when the browser says same-origin, or a script sends neither header, then the write goes through', async () => {
    const a = await cookieFor(await makeUser('operator'), t.config);
    const same = await request(t.app)
      .post('/api/auth/logout')
      .set('Cookie', a)
      .set('Host', 'coretrail.plant.example')
      .set('Origin', 'http://coretrail.plant.example')
      .set('Sec-Fetch-Site', 'same-origin');
    expect(same.status).toBe(204);
    const b = await cookieFor(await makeUser('operator'), t.config);
    expect((await request(t.app).post('/api/auth/logout').set('Cookie', b)).status).toBe(204);
  });

  it('when a page from another site only reads, then nothing is refused (GET is not a write)', async () => {
    const cookie = await cookieFor(await makeUser('operator'), t.config);
    const res = await me(cookie).set('Sec-Fetch-Site', 'cross-site');
    expect(res.status).toBe(200);
  });
});

describe('caching', () => {
  it('when signed in, then JSON replies say Cache-Control: no-store', async () => {
    const cookie = await cookieFor(await makeUser('operator'), t.config);
    for (const url of ['/api/auth/me', '/api/stations', '/api/engine-families']) {
      const res = await request(t.app).get(url).set('Cookie', cookie);
      expect(res.status, url).toBe(200);
      expect(res.headers['cache-control'], url).toBe('no-store');
    }
  });

  it('when nobody is signed in, then the session endpoint answers 200 with null (no console error)', async () => {
    const res = await request(t.app).get('/api/auth/session');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ user: null, permissions: [] });
    const cookie = await cookieFor(await makeUser('operator'), t.config);
    const signedIn = await request(t.app).get('/api/auth/session').set('Cookie', cookie);
    expect(signedIn.body.user.role).toBe('operator');
  });
});
