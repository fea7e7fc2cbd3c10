import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, Customer, PartKindRow, Route, Signature, Stage } from '../../server/models/index.js';
import { processDocument } from '../../shared/schemas/process-document.js';
import type { RouteVersionJson } from '../../shared/schemas/process.js';
import { TEST_PASSWORD, cookieFor, makeTestApp, makeUser, unique, type TestApp } from '../support/app.js';

let t: TestApp;
let admin: string;
let quality: string;
let approver: string;
let approverName: string;
let receiving: string;
let operator: string;

beforeAll(async () => {
  t = makeTestApp();
  admin = await cookieFor(await makeUser('admin'), t.config);
  quality = await cookieFor(await makeUser('quality'), t.config);
  const a = await makeUser('quality', { name: 'Test Route Approver' });
  approverName = a.name;
  approver = await cookieFor(a, t.config);
  receiving = await cookieFor(await makeUser('receiving'), t.config);
  operator = await cookieFor(await makeUser('operator'), t.config);
});
afterAll(() => t.close());

/** A family of the test's own: a small inline four (figures invented for the test). */
async function newFamily() {
  const code = `PT-${unique('').slice(0, 6).toUpperCase()}`;
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

async function draft(cookie: string, family: string, partKind: string, steps: unknown[]) {
  return request(t.app).post('/api/process/routes').set('Cookie', cookie).send({ family, partKind, steps });
}

const approve = (cookie: string, id: number, body: Record<string, unknown> = {}) =>
  request(t.app)
    .post(`/api/process/routes/${id}/approve`)
    .set('Cookie', cookie)
    .send({ reason: 'Set up for the test family', password: TEST_PASSWORD, ...body });

async function receiveCore(familyId: number, castingNumber = `CN${unique('').slice(0, 6).toUpperCase()}`) {
  const customer = (await Customer.findOne())!;
  return request(t.app)
    .post('/api/cores')
    .set('Cookie', receiving)
    .send({
      familyId,
      castingNumber,
      idNumber: unique('ID').toUpperCase(),
      source: 'customer_return',
      customerId: customer.id,
      sourceReference: unique('RMA-'),
      receivedOn: new Date().toISOString().slice(0, 10),
      complete: true,
      grade: 'sound',
      accepted: true,
      creditDecision: 'full',
    });
}

describe('part kinds and stages', () => {
  it('when admin adds a part kind and a hazardous stage for it, then both are listed and audited', async () => {
    const code = `pk_${unique('').slice(0, 8)}`;
    const kind = await request(t.app)
      .post('/api/process/part-kinds')
      .set('Cookie', admin)
      .send({ code, name: 'Oil pump', serialized: false });
    expect(kind.status).toBe(201);
    expect(kind.body).toMatchObject({ code, serialized: false, builtIn: false, retired: false });

    const noCaution = await request(t.app)
      .post('/api/process/stages')
      .set('Cookie', quality)
      .send({ code: `st-${unique('')}`, name: 'Pump pressure test', partKind: code, hazardous: true });
    expect(noCaution.status).toBe(400);
    expect(noCaution.body.error.fields.caution).toMatch(/caution/);

    const stageCode = `st-${unique('')}`;
    const stage = await request(t.app).post('/api/process/stages').set('Cookie', quality).send({
      code: stageCode,
      name: 'Pump pressure test',
      partKind: code,
      hazardous: true,
      caution: 'Pressurised oil: follow the plant procedure.',
    });
    expect(stage.status).toBe(201);
    expect(stage.body).toMatchObject({ code: stageCode, partKind: code, hazardous: true, retired: false });
    const list = await request(t.app).get('/api/process/stages').set('Cookie', operator);
    expect(list.body.find((s: { code: string }) => s.code === stageCode)).toMatchObject({ hazardous: true });
    const events = await AuditEvent.findAll({ where: { entity: 'stage', entityId: String(stage.body.id) } });
    expect(events.map((e) => e.action)).toEqual(['stage.created']);

    const retired = await request(t.app)
      .patch(`/api/process/stages/${stage.body.id}`)
      .set('Cookie', admin)
      .send({ retired: true });
    expect(retired.status).toBe(200);
    expect(retired.body.retired).toBe(true);
  });

  it('when someone retires a built-in part kind or a stage a station records, then it is refused with the reason', async () => {
    const block = await request(t.app)
      .patch('/api/process/part-kinds/block')
      .set('Cookie', admin)
      .send({ retired: true });
    expect(block.status).toBe(409);
    expect(block.body.error.message).toMatch(/stays in use/);
    const stages = await request(t.app).get('/api/process/stages').set('Cookie', admin);
    const clean = stages.body.find((s: { code: string }) => s.code === 'block-clean');
    const res = await request(t.app)
      .patch(`/api/process/stages/${clean.id}`)
      .set('Cookie', admin)
      .send({ retired: true });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/still records this stage/);
  });
});

describe('routes under change control', () => {
  it('when a route is drafted, then only someone else can approve it, with a signature, and it is in force', async () => {
    const family = await newFamily();
    const d = await draft(admin, family.code, 'core', [{ stage: 'intake' }, { stage: 'teardown' }]);
    expect(d.status).toBe(201);
    expect(d.body).toMatchObject({ version: 1, status: 'draft', inForce: false });

    const second = await draft(quality, family.code, 'core', [{ stage: 'intake' }]);
    expect(second.status).toBe(409);

    const own = await draft(quality, family.code, 'block', [{ stage: 'block-clean' }]);
    expect(own.status).toBe(201);
    const self = await approve(quality, own.body.id);
    expect(self.status).toBe(403);
    expect(self.body.error.message).toMatch(/someone else/);

    const wrong = await approve(approver, d.body.id, { password: 'not the password' });
    expect(wrong.status).toBe(400);
    expect((await Route.findByPk(d.body.id))!.status).toBe('draft');

    const ok = await approve(approver, d.body.id);
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ status: 'approved', inForce: true, approvedBy: approverName });
    const sig = await Signature.findOne({ where: { entity: 'route', entityId: String(d.body.id) } });
    expect(sig).toMatchObject({ printedName: approverName, reason: 'Set up for the test family' });
    expect(sig!.meaning).toBe(`Approved the ${family.code} core route, version 1`);
    const actions = (await AuditEvent.findAll({ where: { entity: 'route', entityId: String(d.body.id) } })).map(
      (e) => e.action,
    );
    expect(actions).toEqual(['route.drafted', 'route.approved']);
  });

  it('when a stage is of another part kind, unknown, repeated or reworks forward, then the draft lists each problem', async () => {
    const family = await newFamily();
    const res = await draft(admin, family.code, 'block', [
      { stage: 'block-clean', reworkTo: 'block-crack' },
      { stage: 'crank-grind' },
      { stage: 'no-such-stage' },
      { stage: 'block-clean' },
    ]);
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toEqual(expect.arrayContaining(['steps.0.reworkTo', 'steps.3.stage']));
    const kinds = await draft(admin, family.code, 'block', [
      { stage: 'block-clean' },
      { stage: 'crank-grind' },
      { stage: 'nope-x' },
    ]);
    expect(kinds.status).toBe(400);
    expect(kinds.body.error.fields['steps.1.stage']).toMatch(/is for crankshaft, not block/);
    expect(kinds.body.error.fields['steps.2.stage']).toMatch(/no stage nope-x/);
    expect(await Route.count({ where: { engineFamilyId: family.id } })).toBe(0);
  });

  it('when a new version is approved, then a part already on the route keeps its version until quality moves it', async () => {
    const family = await newFamily();
    const v1 = await draft(admin, family.code, 'core', [{ stage: 'intake' }, { stage: 'teardown' }]);
    expect((await approve(approver, v1.body.id)).status).toBe(200);
    const early = await receiveCore(family.id);
    expect(early.status).toBe(201);

    const washCode = `core-wash-${unique('').slice(0, 5)}`;
    const wash = await request(t.app)
      .post('/api/process/stages')
      .set('Cookie', admin)
      .send({ code: washCode, name: 'Core wash', partKind: 'core' });
    expect(wash.status).toBe(201);
    const v2 = await draft(admin, family.code, 'core', [
      { stage: 'intake' },
      { stage: washCode, required: false },
      { stage: 'teardown', reworkTo: washCode },
    ]);
    expect(v2.body.version).toBe(2);
    expect((await approve(approver, v2.body.id)).status).toBe(200);
    const late = await receiveCore(family.id);

    const stepsOf = async (serial: string) =>
      ((await request(t.app).get(`/api/items/${serial}`).set('Cookie', operator)).body.route as { code: string }[]).map(
        (s) => s.code,
      );
    expect(await stepsOf(early.body.serial)).toEqual(['intake', 'teardown']);
    expect(await stepsOf(late.body.serial)).toEqual(['intake', washCode, 'teardown']);

    const versions = await request(t.app)
      .get(`/api/process/routes?family=${family.code}&partKind=core`)
      .set('Cookie', operator);
    const [newer, older] = versions.body as RouteVersionJson[];
    expect([newer!.version, newer!.status, newer!.parts]).toEqual([2, 'approved', 1]);
    expect([older!.version, older!.status, older!.parts, older!.inForce]).toEqual([1, 'superseded', 1, false]);

    const cmp = await request(t.app)
      .get(`/api/process/routes/compare?a=${v1.body.id}&b=${v2.body.id}`)
      .set('Cookie', operator);
    expect(cmp.body.rows.map((r: { stage: string; change: string }) => `${r.stage}:${r.change}`)).toEqual([
      'intake:same',
      'teardown:changed',
      `${washCode}:added`,
    ]);

    const byOperator = await request(t.app)
      .post(`/api/items/${early.body.serial}/route`)
      .set('Cookie', operator)
      .send({ routeId: v2.body.id, reason: 'Wash before teardown' });
    expect(byOperator.status).toBe(403);
    const moved = await request(t.app)
      .post(`/api/items/${early.body.serial}/route`)
      .set('Cookie', quality)
      .send({ routeId: v2.body.id, reason: 'Wash before teardown' });
    expect(moved.status).toBe(200);
    expect(await stepsOf(early.body.serial)).toEqual(['intake', washCode, 'teardown']);
    const event = await AuditEvent.findOne({ where: { action: 'item.route_moved', entityId: early.body.serial } });
    expect(event!.after).toMatchObject({ version: 2, reason: 'Wash before teardown' });
  });

  it('when a version is approved to take effect later, then the one in force stays until then', async () => {
    const family = await newFamily();
    const v1 = await draft(admin, family.code, 'core', [{ stage: 'intake' }, { stage: 'teardown' }]);
    await approve(approver, v1.body.id);
    const v2 = await draft(admin, family.code, 'core', [{ stage: 'intake' }, { stage: 'teardown', required: false }]);
    const later = new Date(Date.now() + 7 * 86_400_000).toISOString();
    const res = await approve(approver, v2.body.id, { effectiveFrom: later });
    expect(res.status).toBe(200);
    expect(res.body.inForce).toBe(false);
    const core = await receiveCore(family.id);
    expect((await Route.findByPk(v1.body.id))!.status).toBe('approved');
    const item = await request(t.app).get(`/api/items/${core.body.serial}`).set('Cookie', operator);
    expect(item.body.route.map((s: { required: boolean }) => s.required)).toEqual([true, true]);
    const past = await draft(admin, family.code, 'core', [{ stage: 'intake' }]);
    const refused = await approve(approver, past.body.id, { effectiveFrom: '2020-01-01T00:00:00Z' });
    expect(refused.status).toBe(400);
  });
});

describe('characteristics and casting numbers', () => {
  it('when a characteristic is retired, then a rule for it cannot be drafted and stations stop asking for it', async () => {
    const code = `ch-${unique('').slice(0, 8)}`;
    const noUnit = await request(t.app)
      .post('/api/process/characteristics')
      .set('Cookie', quality)
      .send({ stage: 'block-deck', code, name: 'Deck height', kind: 'variable', resolution: 0.01 });
    expect(noUnit.status).toBe(400);
    expect(noUnit.body.error.fields.unit).toMatch(/has a unit/);
    const made = await request(t.app)
      .post('/api/process/characteristics')
      .set('Cookie', quality)
      .send({
        stage: 'block-deck',
        code,
        name: 'Deck height at the corners',
        kind: 'variable',
        unit: 'mm',
        resolution: 0.01,
        positions: { per: 'deck', points: 4 },
        critical: true,
        gaugeKinds: ['height gauge'],
      });
    expect(made.status).toBe(201);
    expect(made.body).toMatchObject({
      stage: 'block-deck',
      unit: 'mm',
      resolution: 0.01,
      gaugeKinds: ['height gauge'],
    });
    const retire = await request(t.app)
      .post(`/api/process/characteristics/${made.body.id}/retire`)
      .set('Cookie', quality)
      .send({ reason: 'Measured at the deck stage already' });
    expect(retire.status).toBe(200);
    const rule = await request(t.app)
      .post('/api/spec/rules')
      .set('Cookie', quality)
      .send({
        family: 'TARN-6',
        characteristicId: made.body.id,
        limits: { limitType: 'range', lowerLimit: 1, upperLimit: 2, resolution: 0.01 },
      });
    expect(rule.status).toBe(409);
    expect(rule.body.error.message).toBe('Deck height at the corners is retired: no rule can be drafted for it.');
  });

  it('when a family lists its casting numbers, then intake asks for a reason on one it does not accept', async () => {
    const family = await newFamily();
    const other = await newFamily();
    const add = (f: string, castingNumber: string) =>
      request(t.app).post(`/api/process/families/${f}/casting-numbers`).set('Cookie', admin).send({ castingNumber });
    const mine = `C${unique('').slice(0, 7).toUpperCase()}`;
    const theirs = `C${unique('').slice(0, 7).toUpperCase()}`;
    expect((await add(family.code, mine.toLowerCase())).body).toMatchObject({ castingNumber: mine, partKind: 'block' });
    expect((await add(family.code, mine)).status).toBe(409);
    await add(other.code, theirs);

    expect((await receiveCore(family.id, mine)).status).toBe(201);
    const wrong = await receiveCore(family.id, theirs);
    expect(wrong.status).toBe(409);
    expect(wrong.body.error.mismatches).toContain(
      `Casting number ${theirs} is not one ${family.code} accepts; ${other.code} lists it. Check the family chosen.`,
    );
  });
});

describe('one process document', () => {
  it('when admin exports the plant, then the document passes its own schema and checks clean against the plant', async () => {
    const res = await request(t.app).get('/api/process/document').set('Cookie', admin);
    expect(res.status).toBe(200);
    const parsed = processDocument.safeParse(res.body);
    expect(parsed.success ? [] : parsed.error.issues.slice(0, 5)).toEqual([]);
    expect(res.body.families.map((f: { code: string }) => f.code)).toEqual(
      expect.arrayContaining(['TARN-6', 'CORRIE-8']),
    );
    const tarnBlock = (res.body.routes as { family: string; partKind: string; steps: { stage: string }[] }[]).find(
      (r) => r.family === 'TARN-6' && r.partKind === 'block',
    );
    expect(tarnBlock!.steps[0]!.stage).toBe('block-clean');
    // the body limit of the API is 256 kB (server/app.ts): a whole plant must fit in one request
    expect(Buffer.byteLength(JSON.stringify(res.body))).toBeLessThan(256 * 1024);
    const check = await request(t.app).post('/api/process/document/check').set('Cookie', quality).send(res.body);
    expect(check.status).toBe(200);
    expect(check.body).toMatchObject({ ok: true, new: { partKinds: 0, families: 0, stages: 0 } });
  });

  it('when a document is bad in shape and in references, then each problem is listed by its path and nothing is written', async () => {
    const shape = await request(t.app)
      .post('/api/process/document/check')
      .set('Cookie', admin)
      .send({
        format: 'coretrail-process',
        version: 1,
        partKinds: [{ code: 'X' }],
        families: [],
        stages: [],
        characteristics: [],
        routes: [],
        castingNumbers: 'none',
      });
    expect(shape.status).toBe(400);
    expect(Object.keys(shape.body.error.fields)).toEqual(
      expect.arrayContaining(['partKinds.0.code', 'partKinds.0.name', 'castingNumbers']),
    );
    const refs = await request(t.app)
      .post('/api/process/document/check')
      .set('Cookie', admin)
      .send({
        format: 'coretrail-process',
        version: 1,
        partKinds: [],
        families: [],
        stages: [{ code: 'pump-test', partKind: 'oil_pump', name: 'Pump test' }],
        characteristics: [],
        routes: [{ family: 'TARN-6', partKind: 'block', steps: [{ stage: 'crank-grind' }] }],
        castingNumbers: [],
      });
    expect(refs.status).toBe(400);
    expect(refs.body.error.message).toBe('The document has 2 problems; nothing was changed.');
    expect(refs.body.error.fields).toEqual({
      'stages.0.partKind': 'No part kind oil_pump.',
      'routes.0.steps.0.stage': 'Stage crank-grind is for crankshaft, not block.',
    });
    expect(await Stage.count({ where: { code: 'pump-test' } })).toBe(0);
    expect(await PartKindRow.count({ where: { code: 'oil_pump' } })).toBe(0);
  });
});
