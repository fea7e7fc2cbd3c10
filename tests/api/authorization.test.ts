import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { can } from '../../shared/permissions.js';
import { ROLES, type Role } from '../../shared/roles.js';
import { cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';

// Every API route, called as every role and signed out, against the permission matrix in shared/.
// Bodies are empty, so an allowed call stops at validation (or finds nothing) and writes nothing.
let t: TestApp;
const cookies = new Map<Role, string>();

beforeAll(async () => {
  t = makeTestApp();
  for (const role of ROLES) cookies.set(role, await cookieFor(await makeUser(role), t.config));
});
afterAll(() => t.close());

function call(method: string, path: string, cookie?: string) {
  const url = path.replace(/:[a-zA-Z]+/g, '987654');
  const req = request(t.app)[method as 'get'](url);
  if (cookie) req.set('Cookie', cookie);
  return method === 'get' ? req : req.send({});
}

describe('authorization matrix', () => {
  it('has routes to check', () => {
    expect(t.app.apiRoutes.length).toBeGreaterThan(10);
  });

  it('when signed out, then only public routes answer without 401', async () => {
    for (const r of t.app.apiRoutes) {
      const res = await call(r.method, r.path);
      if (r.access === 'public') expect(res.status, `${r.method} ${r.path}`).not.toBe(401);
      else expect(res.status, `${r.method} ${r.path}`).toBe(401);
    }
  });

  for (const role of ROLES) {
    it(`when signed in as ${role}, then each route allows or refuses as the matrix says`, async () => {
      // sign-out would end the shared session, so it is checked with a session of its own
      for (const r of t.app.apiRoutes) {
        const cookie =
          r.path === '/api/auth/logout' ? await cookieFor(await makeUser(role), t.config) : cookies.get(role)!;
        const res = await call(r.method, r.path, cookie);
        const label = `${role} ${r.method.toUpperCase()} ${r.path} → ${res.status}`;
        const access = r.access;
        // a person's session is not a station tablet's sign-in, whatever the role
        if (access === 'tablet') {
          expect(res.status, label).toBe(401);
          continue;
        }
        const allowed = access === 'public' || access === 'signed-in' || can(role, access);
        if (allowed) expect([401, 403], label).not.toContain(res.status);
        else expect(res.status, label).toBe(403);
        expect(res.status, label).toBeLessThan(500);
      }
    });
  }

  it('an unknown API path is a JSON 404, not the client page', async () => {
    const res = await request(t.app).get('/api/no-such-thing').set('Cookie', cookies.get('admin')!);
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
  });
});
