import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nominalSizeClasses, passingReadings } from '../../db/seeders/sample-readings.js';
import { AuditEvent, Characteristic, Signature, Stage, ToleranceRule } from '../../server/models/index.js';
import type { SpecBookJson } from '../../shared/schemas/spec.js';
import { TEST_PASSWORD, cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';
import { formFor, gaugesOf, passThrough, tornDownCore } from '../support/parts.js';

let t: TestApp;
let quality: string;
// the drafts are approved by another quality engineer: an author never approves their own
let approver: string;
let approverName: string;
let receiving: string;
let operator: string;

beforeAll(async () => {
  t = makeTestApp();
  const q = await makeUser('quality', { name: 'Test Quality Engineer' });
  quality = await cookieFor(q, t.config);
  const a = await makeUser('quality', { name: 'Test Approving Engineer' });
  approverName = a.name;
  approver = await cookieFor(a, t.config);
  receiving = await cookieFor(await makeUser('receiving'), t.config);
  operator = await cookieFor(await makeUser('operator'), t.config);
});
afterAll(() => t.close());

async function characteristic(stage: string, code: string) {
  const s = (await Stage.findOne({ where: { code: stage } }))!;
  return (await Characteristic.findOne({ where: { stageId: s.id, code } }))!;
}

const range = (lowerLimit: number, upperLimit: number, resolution = 1) => ({
  limitType: 'range',
  lowerLimit,
  upperLimit,
  resolution,
  sourceNote: 'Test: tighter plateau finish',
});

describe('the spec book', () => {
  it('lists each stage’s characteristics with the rule in force, signed', async () => {
    const res = await request(t.app).get('/api/spec/book?family=corrie-8').set('Cookie', operator);
    expect(res.status).toBe(200);
    const book = res.body as SpecBookJson;
    const bore = book.stages.find((s) => s.code === 'bore-hone')!.characteristics.find((c) => c.code === 'bore')!;
    expect(bore).toMatchObject({
      kind: 'variable',
      unit: 'in',
      positionsLabel: 'Each cylinder × top, middle, bottom × thrust, axial',
    });
    expect(bore.inForce).toMatchObject({ status: 'approved', lower: 4.0295, upper: 4.0305 });
    expect(bore.inForce!.signature!.meaning).toMatch(/^Approved CORRIE-8 Cylinder bore diameter, version \d+/);
    expect(bore.inForce!.sourceNote).toMatch(/from memory/);
    const crack = book.stages.find((s) => s.code === 'block-crack')!.characteristics[0]!;
    expect(crack).toMatchObject({ kind: 'attribute', inForce: null });
    const unknown = await request(t.app).get('/api/spec/book?family=NOPE').set('Cookie', operator);
    expect(unknown.status).toBe(404);
  });

  it('refuses a draft whose limits do not make sense, field by field', async () => {
    const c = await characteristic('bore-hone', 'bore-finish');
    const res = await request(t.app)
      .post('/api/spec/rules')
      .set('Cookie', quality)
      .send({ family: 'TARN-6', characteristicId: c.id, limits: { limitType: 'nominal', nominal: 25, resolution: 0 } });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toMatchObject({
      'limits.minusTol': 'Enter the minus tolerance (0 if none).',
      'limits.plusTol': 'Enter the plus tolerance (0 if none).',
      'limits.resolution': 'The resolution must be more than 0.',
    });
    const inverted = await request(t.app)
      .post('/api/spec/rules')
      .set('Cookie', quality)
      .send({ family: 'TARN-6', characteristicId: c.id, limits: range(30, 15) });
    expect(inverted.body.error.fields['limits.upperLimit']).toMatch(/above the lower/);
    const crack = await characteristic('block-crack', 'crack-free');
    const attr = await request(t.app)
      .post('/api/spec/rules')
      .set('Cookie', quality)
      .send({ family: 'TARN-6', characteristicId: crack.id, limits: range(0, 1) });
    expect(attr.status).toBe(400);
    expect(attr.body.error.message).toMatch(/pass\/fail check/);
  });
});

describe('drafting and approving a new version', () => {
  it('when quality approves a tighter finish, then new results are judged by it and old results keep their version', async () => {
    const c = await characteristic('bore-hone', 'bore-finish');
    const v1 = (await ToleranceRule.findOne({
      where: { characteristicId: c.id, status: 'approved' },
      include: [{ association: 'family', where: { code: 'TARN-6' } }],
    }))!;

    // a block recorded under the old version: Ra 32 µin is inside 15–35
    const a = await tornDownCore(t, { receiving, operator }, 'TARN-6');
    await passThrough(t, operator, ['CLN-1', 'MPI-1', 'PT-1', 'LH-1'], a.block);
    const formA = await formFor(t, operator, 'BH-1', a.block);
    const before = await request(t.app)
      .post('/api/results')
      .set('Cookie', operator)
      .send({
        idempotencyKey: randomUUID(),
        serial: a.block,
        station: 'BH-1',
        ...gaugesOf(formA),
        readings: passingReadings(formA, (code, _p, v) => (code === 'bore-finish' ? 32 : v)),
        sizeClasses: nominalSizeClasses(formA),
      });
    expect(before.body.verdict).toBe('pass');

    const draft = await request(t.app)
      .post('/api/spec/rules')
      .set('Cookie', quality)
      .send({ family: 'TARN-6', characteristicId: c.id, limits: range(15, 28) });
    expect(draft.status).toBe(201);
    expect(draft.body).toMatchObject({ version: v1.version + 1, status: 'draft', unit: 'µin', lower: 15, upper: 28 });
    const second = await request(t.app)
      .post('/api/spec/rules')
      .set('Cookie', quality)
      .send({ family: 'TARN-6', characteristicId: c.id, limits: range(15, 29) });
    expect(second.status).toBe(409);
    expect(second.body.error.draftId).toBe(draft.body.id);
    const edited = await request(t.app)
      .patch(`/api/spec/rules/${draft.body.id}`)
      .set('Cookie', quality)
      .send({ limits: range(15, 30) });
    expect(edited.body.upper).toBe(30);

    // a wrong password signs nothing and changes nothing
    const refused = await request(t.app)
      .post(`/api/spec/rules/${draft.body.id}/approve`)
      .set('Cookie', approver)
      .send({ reason: 'Plateau finish for the new ring pack', password: 'not my password' });
    expect(refused.status).toBe(400);
    expect(refused.body.error).toMatchObject({
      code: 'signature_refused',
      fields: { password: 'That is not your password.' },
    });
    expect((await ToleranceRule.findByPk(draft.body.id))!.status).toBe('draft');
    expect(await Signature.count({ where: { entity: 'tolerance_rule', entityId: String(draft.body.id) } })).toBe(0);

    const approved = await request(t.app)
      .post(`/api/spec/rules/${draft.body.id}/approve`)
      .set('Cookie', approver)
      .send({ reason: 'Plateau finish for the new ring pack', password: TEST_PASSWORD });
    expect(approved.status).toBe(200);
    expect(approved.body).toMatchObject({
      status: 'approved',
      approvedBy: approverName,
      approvalReason: 'Plateau finish for the new ring pack',
    });
    expect(approved.body.signature).toMatchObject({
      printedName: approverName,
      meaning: `Approved TARN-6 Bore surface finish Ra, version ${v1.version + 1}`,
    });
    await v1.reload();
    expect(v1.status).toBe('superseded');
    expect(v1.supersededAt!.toISOString()).toBe(approved.body.effectiveFrom);
    const events = await AuditEvent.findAll({
      where: { entity: 'tolerance_rule', entityId: [String(v1.id), String(draft.body.id)] },
      order: [['id', 'ASC']],
    });
    expect(events.map((e) => e.action)).toEqual([
      'spec.draft_created',
      'spec.draft_edited',
      'spec.rule_superseded',
      'spec.rule_approved',
    ]);

    // an approved version is never edited: the API says so, and the database refuses too
    const edit = await request(t.app)
      .patch(`/api/spec/rules/${draft.body.id}`)
      .set('Cookie', quality)
      .send({ limits: range(10, 40) });
    expect(edit.status).toBe(409);
    expect(edit.body.error.message).toMatch(/never edited/);
    await expect(
      t.sequelize.query(`UPDATE tolerance_rules SET upper_limit = 99 WHERE id = ${draft.body.id}`),
    ).rejects.toThrow(/cannot be edited/);

    // a block recorded now: the same Ra 32 µin fails version 2
    const b = await tornDownCore(t, { receiving, operator }, 'TARN-6');
    await passThrough(t, operator, ['CLN-1', 'MPI-1', 'PT-1', 'LH-1'], b.block);
    const formB = await formFor(t, operator, 'BH-1', b.block);
    expect(formB.characteristics.find((x) => x.code === 'bore-finish')!.rule).toMatchObject({
      version: v1.version + 1,
      upperLimit: 30,
    });
    const after = await request(t.app)
      .post('/api/results')
      .set('Cookie', operator)
      .send({
        idempotencyKey: randomUUID(),
        serial: b.block,
        station: 'BH-1',
        ...gaugesOf(formB),
        readings: passingReadings(formB, (code, _p, v) => (code === 'bore-finish' ? 32 : v)),
        sizeClasses: nominalSizeClasses(formB),
      });
    expect(after.body.verdict).toBe('fail');
    expect(after.body.failing).toEqual([
      expect.objectContaining({ characteristic: 'bore-finish', ruleVersion: v1.version + 1, upper: 30 }),
    ]);
    // …while the first block's result still shows the version it was judged by
    const history = await request(t.app).get(`/api/items/${a.block}/results`).set('Cookie', operator);
    const finish = history.body[0].readings.find((r: { characteristic: string }) => r.characteristic === 'bore-finish');
    expect(finish).toMatchObject({ value: 32, verdict: 'pass', ruleVersion: v1.version, lower: 15, upper: 35 });

    const versions = await request(t.app)
      .get(`/api/spec/history?family=TARN-6&characteristicId=${c.id}`)
      .set('Cookie', quality);
    expect(versions.body.versions.map((v: { version: number; status: string }) => [v.version, v.status])).toEqual([
      [v1.version + 1, 'approved'],
      [v1.version, 'superseded'],
    ]);
  });

  it('a version approved for later waits; the one in force stays until then, and no third can queue', async () => {
    const c = await characteristic('crank-grind', 'journal-finish');
    const draft = await request(t.app)
      .post('/api/spec/rules')
      .set('Cookie', quality)
      .send({ family: 'TARN-6', characteristicId: c.id, limits: { limitType: 'max', upperLimit: 12, resolution: 1 } });
    const past = await request(t.app)
      .post(`/api/spec/rules/${draft.body.id}/approve`)
      .set('Cookie', approver)
      .send({ reason: 'Backdated', password: TEST_PASSWORD, effectiveFrom: '2020-01-01T00:00:00Z' });
    expect(past.status).toBe(400);
    expect(past.body.error.fields.effectiveFrom).toBe('Choose now or a later time.');
    const later = new Date(Date.now() + 7 * 86_400_000).toISOString();
    const ok = await request(t.app)
      .post(`/api/spec/rules/${draft.body.id}/approve`)
      .set('Cookie', approver)
      .send({ reason: 'From next week’s grinding wheels', password: TEST_PASSWORD, effectiveFrom: later });
    expect(ok.status).toBe(200);
    const book = (await request(t.app).get('/api/spec/book?family=TARN-6').set('Cookie', quality)).body as SpecBookJson;
    const jf = book.stages
      .find((s) => s.code === 'crank-grind')!
      .characteristics.find((x) => x.code === 'journal-finish')!;
    expect(jf.inForce).toMatchObject({ upper: 15, status: 'superseded' });
    expect(jf.scheduled).toMatchObject({ upper: 12, status: 'approved', effectiveFrom: later });
    const third = await request(t.app)
      .post('/api/spec/rules')
      .set('Cookie', quality)
      .send({ family: 'TARN-6', characteristicId: c.id, limits: { limitType: 'max', upperLimit: 10, resolution: 1 } });
    const queued = await request(t.app)
      .post(`/api/spec/rules/${third.body.id}/approve`)
      .set('Cookie', approver)
      .send({ reason: 'Even finer', password: TEST_PASSWORD });
    expect(queued.status).toBe(409);
    expect(queued.body.error.message).toMatch(/already approved to take effect/);
    const discarded = await request(t.app).post(`/api/spec/rules/${third.body.id}/discard`).set('Cookie', quality);
    expect(discarded.body.status).toBe('withdrawn');
  });
});
