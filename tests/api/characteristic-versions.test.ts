import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, Characteristic } from '../../server/models/index.js';
import { TEST_PASSWORD, cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';
import { ownCharacteristic } from '../support/characteristics.js';

let t: TestApp;
let author: string;
let approver: string;
let operator: string;

beforeAll(async () => {
  t = makeTestApp();
  author = await cookieFor(await makeUser('quality'), t.config);
  approver = await cookieFor(await makeUser('quality', { name: 'Test Change Approver' }), t.config);
  operator = await cookieFor(await makeUser('operator'), t.config);
});
afterAll(() => t.close());

const newCharacteristic = () => ownCharacteristic(t, author, 'cv', 'Deck check of the test');

const approve = (cookie: string, id: number, body: object = {}) =>
  request(t.app)
    .post(`/api/process/characteristic-versions/${id}/approve`)
    .set('Cookie', cookie)
    .send({ reason: 'Deck height is critical to the head gasket', password: TEST_PASSWORD, ...body });

describe('characteristic changes under change control', () => {
  it('when a change is drafted, then it applies only once someone else approves it, and versions compare side by side', async () => {
    const c = await newCharacteristic();
    const draft = (body: object) =>
      request(t.app).post(`/api/process/characteristics/${c.id}/versions`).set('Cookie', author).send(body);
    expect((await draft({ note: 'Nothing at all', name: 'Deck height' })).status).toBe(400);
    expect((await draft({ note: 'Bad range', physicalMin: 400 })).body.error.fields).toEqual({
      physicalMax: 'The highest possible value is above the lowest.',
    });
    const d = await draft({ note: 'Critical from now on', critical: true, gaugeKinds: ['height gauge'] });
    expect(d.status).toBe(201);
    expect(d.body).toMatchObject({ version: 2, status: 'draft', inForce: false });
    expect((await draft({ note: 'A second one', help: 'x' })).status).toBe(409);
    expect((await Characteristic.findByPk(c.id))!.critical).toBe(false);

    expect((await approve(author, d.body.id)).status).toBe(403);
    expect((await approve(operator, d.body.id)).status).toBe(403);
    expect((await approve(approver, d.body.id, { effectiveFrom: '2020-01-01T00:00:00Z' })).status).toBe(400);
    const ok = await approve(approver, d.body.id);
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ status: 'approved', inForce: true, approvedBy: 'Test Change Approver' });
    const row = (await Characteristic.findByPk(c.id))!;
    expect([row.critical, row.gaugeKinds]).toEqual([true, ['height gauge']]);

    const list = await request(t.app).get(`/api/process/characteristics/${c.id}/versions`).set('Cookie', operator);
    expect(list.body.versions.map((v: { version: number; status: string }) => [v.version, v.status])).toEqual([
      [2, 'approved'],
      [1, 'superseded'],
    ]);
    const [v2, v1] = list.body.versions as { id: number }[];
    const cmp = await request(t.app)
      .get('/api/process/characteristic-versions/compare')
      .query({ a: v1!.id, b: v2!.id })
      .set('Cookie', operator);
    expect(cmp.status).toBe(200);
    expect(cmp.body.rows.filter((r: { changed: boolean }) => r.changed)).toEqual([
      { field: 'critical', left: false, right: true, changed: true },
      { field: 'gaugeKinds', left: [], right: ['height gauge'], changed: true },
    ]);
    const actions = (
      await AuditEvent.findAll({ where: { entity: 'characteristic', entityId: String(c.id) }, order: [['id', 'ASC']] })
    ).map((e) => e.action);
    expect(actions).toEqual([
      'characteristic.created',
      'characteristic.change_drafted',
      'characteristic.change_approved',
      'characteristic.change_applied',
    ]);
  });

  it('when a change is approved to take effect later, then the characteristic changes when its time comes', async () => {
    const c = await newCharacteristic();
    const d = await request(t.app)
      .post(`/api/process/characteristics/${c.id}/versions`)
      .set('Cookie', author)
      .send({ note: 'New name from the next shift', name: 'Deck height at the corners' });
    const soon = new Date(Date.now() + 2_000).toISOString();
    const ok = await approve(approver, d.body.id, { effectiveFrom: soon });
    expect(ok.body).toMatchObject({ status: 'approved', inForce: false });
    expect((await Characteristic.findByPk(c.id))!.name).toBe('Deck height');
    await new Promise((r) => setTimeout(r, 2_500));
    const list = await request(t.app).get(`/api/process/characteristics/${c.id}/versions`).set('Cookie', operator);
    expect(list.body.current.name).toBe('Deck height at the corners');
    expect(list.body.versions[0]).toMatchObject({ version: 2, inForce: true });
  });
});
