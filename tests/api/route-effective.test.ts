import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, Route } from '../../server/models/index.js';
import { TEST_PASSWORD, cookieFor, makeTestApp, makeUser, unique, type TestApp } from '../support/app.js';

let t: TestApp;
let admin: string;
let approver: string;

beforeAll(async () => {
  t = makeTestApp();
  admin = await cookieFor(await makeUser('admin'), t.config);
  approver = await cookieFor(await makeUser('quality'), t.config);
});
afterAll(() => t.close());

async function newFamily() {
  const code = `PE-${unique('').slice(0, 6).toUpperCase()}`;
  const res = await request(t.app)
    .post('/api/engine-families')
    .set('Cookie', admin)
    .send({
      code,
      name: `Test family ${code}`,
      layout: 'inline',
      cylinders: 4,
      boreMm: 86,
      strokeMm: 86,
      headsPerEngine: 1,
      warrantyMonths: 12,
      warrantyKm: null,
    });
  expect(res.status).toBe(201);
  return res.body as { id: number; code: string };
}

const draft = (family: string, steps: unknown[]) =>
  request(t.app).post('/api/process/routes').set('Cookie', admin).send({ family, partKind: 'core', steps });
const approve = (id: number, body: Record<string, unknown> = {}) =>
  request(t.app)
    .post(`/api/process/routes/${id}/approve`)
    .set('Cookie', approver)
    .send({ reason: 'Wash before teardown from now on', password: TEST_PASSWORD, ...body });

describe('a route version approved to take effect later', () => {
  it('when its time comes, then it is the one in force everywhere and the one before is superseded', async () => {
    const family = await newFamily();
    const v1 = await draft(family.code, [{ stage: 'intake' }, { stage: 'teardown' }]);
    expect((await approve(v1.body.id)).status).toBe(200);
    const v2 = await draft(family.code, [{ stage: 'intake' }, { stage: 'teardown', required: false }]);
    const soon = new Date(Date.now() + 2_500).toISOString();
    const approved = await approve(v2.body.id, { effectiveFrom: soon });
    expect(approved.status).toBe(200);
    expect(approved.body.inForce).toBe(false);
    expect((await Route.findByPk(v2.body.id))!.active).toBe(false);

    await new Promise((r) => setTimeout(r, 3_000));

    const list = await request(t.app)
      .get(`/api/process/routes?family=${family.code}&partKind=core`)
      .set('Cookie', admin);
    expect(list.status).toBe(200);
    expect(list.body.map((r: { version: number; inForce: boolean }) => [r.version, r.inForce])).toEqual([
      [2, true],
      [1, false],
    ]);
    // the stored flag the line reads and the document export use follows the times too
    const [newer, older] = [(await Route.findByPk(v2.body.id))!, (await Route.findByPk(v1.body.id))!];
    expect([newer.active, newer.status]).toEqual([true, 'approved']);
    expect([older.active, older.status]).toEqual([false, 'superseded']);
    const doc = await request(t.app).get('/api/process/document').set('Cookie', admin);
    const mine = (doc.body.routes as { family: string; steps: { required: boolean }[] }[]).filter(
      (r) => r.family === family.code,
    );
    expect(mine.map((r) => r.steps.map((s) => s.required))).toEqual([[true, false]]);
    const events = await AuditEvent.findAll({ where: { action: 'route.took_effect', entityId: String(v2.body.id) } });
    expect(events).toHaveLength(1);
  });
});
