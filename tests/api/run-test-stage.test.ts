import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, Item, Stage } from '../../server/models/index.js';
import { releaseCheck } from '../../server/services/release/index.js';
import { cookieFor, makeTestApp, makeUser, unique, type TestApp } from '../support/app.js';
import { releasableUnit } from '../support/parts.js';

/**
 * A plant names its own stages, so the release gate knows the unit's run test by the stage's flag,
 * not by a code the product chose. Common practice: a remanufactured engine is run before it ships.
 */

let t: TestApp;
let quality: string;
let cookies: { receiving: string; operator: string };

beforeAll(async () => {
  t = makeTestApp();
  quality = await cookieFor(await makeUser('quality'), t.config);
  cookies = {
    receiving: await cookieFor(await makeUser('receiving'), t.config),
    operator: await cookieFor(await makeUser('operator', { name: 'Run Test Operator' }), t.config),
  };
});
afterAll(() => t.close());

describe('the stage that is the unit’s run test', () => {
  it('when quality adds a long block stage marked as the run test, then it is kept and shown so; on any other part it is refused and nothing is stored', async () => {
    const refusedCode = `rt-${unique('')}`;
    const refused = await request(t.app)
      .post('/api/process/stages')
      .set('Cookie', quality)
      .send({ code: refusedCode, name: 'Block leak test', partKind: 'block', runTest: true });
    expect(refused.status).toBe(400);
    expect(refused.body.error.fields.runTest).toMatch(/long block/);
    expect(await Stage.count({ where: { code: refusedCode } })).toBe(0);

    const code = `rt-${unique('')}`;
    const made = await request(t.app).post('/api/process/stages').set('Cookie', quality).send({
      code,
      name: 'Dynamometer run',
      partKind: 'long_block',
      runTest: true,
      hazardous: true,
      caution: 'A running engine: follow the plant’s test cell procedure.',
    });
    expect(made.status, JSON.stringify(made.body)).toBe(201);
    expect(made.body).toMatchObject({ code, runTest: true });
    const list = await request(t.app).get('/api/process/stages').set('Cookie', quality);
    expect(list.body.find((s: { code: string }) => s.code === code)).toMatchObject({ runTest: true });
    expect(list.body.find((s: { code: string }) => s.code === 'block-clean')).toMatchObject({ runTest: false });

    const unmarked = await request(t.app)
      .patch(`/api/process/stages/${made.body.id}`)
      .set('Cookie', quality)
      .send({ runTest: false });
    expect(unmarked.status).toBe(200);
    expect(unmarked.body.runTest).toBe(false);
    const events = await AuditEvent.findAll({ where: { entity: 'stage', entityId: String(made.body.id) } });
    expect(events.map((e) => e.action)).toEqual(['stage.created', 'stage.updated']);
    expect(events[1]!.before).toMatchObject({ runTest: true });
    expect(events[1]!.after).toMatchObject({ runTest: false });

    const blockStage = list.body.find((s: { code: string }) => s.code === 'block-clean');
    const wrongKind = await request(t.app)
      .patch(`/api/process/stages/${blockStage.id}`)
      .set('Cookie', quality)
      .send({ runTest: true });
    expect(wrongKind.status).toBe(400);
    expect((await Stage.findByPk(blockStage.id))!.runTest).toBe(false);
  });

  it('when a unit’s route has no stage marked as its run test, then release is refused with that reason, though every stage passed', async () => {
    const { unit } = await releasableUnit(t, cookies, 'TARN-6', `RT${unique('').slice(0, 5).toUpperCase()}`);
    const item = (await Item.findOne({ where: { serial: unit } }))!;
    expect((await releaseCheck(t.sequelize, item)).releasable).toBe(true);

    // the flag cleared inside a transaction that is rolled back, so no other test sees it
    const seen = await t.sequelize
      .transaction(async (transaction) => {
        await Stage.update({ runTest: false }, { where: { code: 'run-test' }, transaction });
        const check = await releaseCheck(t.sequelize, item, transaction);
        throw Object.assign(new Error('roll back'), { check });
      })
      .catch((e: { check?: Awaited<ReturnType<typeof releaseCheck>> }) => e.check);
    expect(seen?.releasable).toBe(false);
    expect(seen?.reasons.map((r) => r.code)).toEqual(['run_test']);
    expect(seen?.reasons[0]!.message).toMatch(/no required stage marked as the unit's run test/);
    expect(seen?.checks.find((c) => c.label === 'The run test passed')?.ok).toBe(false);
    expect((await Stage.findOne({ where: { code: 'run-test' } }))!.runTest).toBe(true);
  });
});
