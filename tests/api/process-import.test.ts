import { Op } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  AuditEvent,
  Characteristic,
  EngineFamily,
  FamilyCastingNumber,
  PartKindRow,
  ProcessImport,
  Route,
  Signature,
  Stage,
} from '../../server/models/index.js';
import { demoProcessDocument } from '../../db/seeders/process-document.js';
import { TEST_PASSWORD, cookieFor, makeTestApp, makeUser, unique, type TestApp } from '../support/app.js';

let t: TestApp;
let admin: string;
let author: string;
let authorId: number;
let approver: string;

beforeAll(async () => {
  t = makeTestApp();
  admin = await cookieFor(await makeUser('admin'), t.config);
  const authorUser = await makeUser('quality');
  authorId = authorUser.id;
  author = await cookieFor(authorUser, t.config);
  approver = await cookieFor(await makeUser('quality', { name: 'Test Import Approver' }), t.config);
  // a draft left by an earlier run that stopped half way would hold the one draft place
  await ProcessImport.update({ status: 'discarded' }, { where: { status: 'draft' } });
});
afterAll(() => t.close());

/** A small plant of the test's own: a pump kind, its test stage, a family, its route and a casting number. */
function document() {
  const tag = unique('').slice(0, 6);
  const kind = `pump_${tag}`;
  const family = `IM-${tag.toUpperCase()}`;
  return {
    tag,
    kind,
    family,
    stage: `pump-test-${tag}`,
    doc: {
      format: 'coretrail-process',
      version: 1,
      partKinds: [{ code: kind, name: 'Oil pump', serialized: false }],
      families: [
        {
          code: family,
          name: 'Imported inline four',
          layout: 'inline',
          cylinders: 4,
          boreMm: 82,
          strokeMm: 90,
          headsPerEngine: 1,
          warrantyMonths: 12,
          warrantyKm: null,
        },
      ],
      stages: [
        { code: `pump-clean-${tag}`, partKind: kind, name: 'Pump wash' },
        {
          code: `pump-test-${tag}`,
          partKind: kind,
          name: 'Pump flow test',
          caution: 'Hot oil under pressure.',
          hazardous: true,
        },
      ],
      characteristics: [
        {
          stage: `pump-test-${tag}`,
          code: 'flow',
          name: 'Flow at 3000 rpm',
          kind: 'variable',
          unit: 'kPa',
          resolution: 1,
          critical: true,
        },
      ],
      routes: [
        {
          family,
          partKind: kind,
          steps: [{ stage: `pump-clean-${tag}` }, { stage: `pump-test-${tag}`, reworkTo: `pump-clean-${tag}` }],
        },
      ],
      castingNumbers: [{ family, castingNumber: `CN-${tag.toUpperCase()}` }],
    },
  };
}

/** The rows a document with this tag could write, and the imports its author could store: other files write theirs meanwhile. */
const counts = async (tag: string) => {
  const like = { [Op.iLike]: `%${tag}%` };
  return [
    await ProcessImport.count({ where: { createdById: authorId } }),
    await PartKindRow.count({ where: { code: like } }),
    await EngineFamily.count({ where: { code: like } }),
    await Stage.count({ where: { code: like } }),
    await Characteristic.count({ include: [{ model: Stage, as: 'stage', where: { code: like }, required: true }] }),
    await Route.count({ where: { partKind: like } }),
    await FamilyCastingNumber.count({ where: { castingNumber: like } }),
  ];
};

describe('importing a process document', () => {
  it('when the document is bad, then every problem is listed by its path and nothing is written', async () => {
    const { doc, tag } = document();
    const before = await counts(tag);
    const shape = await request(t.app)
      .post('/api/process/imports')
      .set('Cookie', author)
      .send({ ...doc, partKinds: [{ code: 'X' }], castingNumbers: [{ family: doc.families[0]!.code }] });
    expect(shape.status).toBe(400);
    expect(Object.keys(shape.body.error.fields)).toEqual(
      expect.arrayContaining(['partKinds.0.code', 'partKinds.0.name', 'castingNumbers.0.castingNumber']),
    );
    const refs = await request(t.app)
      .post('/api/process/imports')
      .set('Cookie', author)
      .send({
        ...doc,
        characteristics: [{ ...doc.characteristics[0], stage: 'no-such-stage', defectCode: 'NOPE' }],
        routes: [{ ...doc.routes[0], steps: [{ stage: 'crank-grind' }] }],
      });
    expect(refs.status).toBe(400);
    expect(refs.body.error.message).toBe('The document has 3 problems; nothing was changed.');
    expect(refs.body.error.fields).toEqual({
      'characteristics.0.stage': 'No stage no-such-stage.',
      'characteristics.0.defectCode': 'No defect code NOPE in use.',
      [`routes.0.steps.0.stage`]: `Stage crank-grind is for crankshaft, not ${doc.partKinds[0]!.code}.`,
    });
    expect(await counts(tag)).toEqual(before);
  });

  it('when a document is imported, then it changes the plant only once someone else approves it with a signature', async () => {
    const { doc, kind, family, stage } = document();
    const draft = await request(t.app)
      .post('/api/process/imports')
      .query({ note: 'Pump line' })
      .set('Cookie', author)
      .send(doc);
    expect(draft.status).toBe(201);
    expect(draft.body).toMatchObject({
      status: 'draft',
      note: 'Pump line',
      plan: {
        partKinds: [kind],
        families: [family],
        stages: [`pump-clean-${kind.slice(5)}`, stage],
        characteristics: [`${stage}/flow`],
        routes: [`${family} ${kind}`],
        castingNumbers: [`${family} CN-${kind.slice(5).toUpperCase()}`],
        kept: 0,
      },
    });
    // nothing applied while it is a draft, and a second draft waits for the first
    expect(await Stage.count({ where: { code: stage } })).toBe(0);
    const second = await request(t.app).post('/api/process/imports').set('Cookie', admin).send(document().doc);
    expect(second.status).toBe(409);

    const approve = (cookie: string, body: object = {}) =>
      request(t.app)
        .post(`/api/process/imports/${draft.body.id}/approve`)
        .set('Cookie', cookie)
        .send({ reason: 'Pump line set up from its document', password: TEST_PASSWORD, ...body });
    expect((await approve(author)).status).toBe(403);
    expect((await approve(admin)).status).toBe(403);
    const wrong = await approve(approver, { password: 'not the password' });
    expect(wrong.status).toBe(400);
    expect(await Stage.count({ where: { code: stage } })).toBe(0);

    const ok = await approve(approver);
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ status: 'approved', approvedBy: 'Test Import Approver' });
    const made = (await Stage.findOne({ where: { code: stage } }))!;
    expect([made.hazardous, made.hazard]).toEqual([true, 'Hot oil under pressure.']);
    const routes = await request(t.app)
      .get('/api/process/routes')
      .query({ family, partKind: kind })
      .set('Cookie', admin);
    expect(routes.body).toHaveLength(1);
    expect(routes.body[0]).toMatchObject({
      version: 1,
      status: 'approved',
      inForce: true,
      approvedBy: 'Test Import Approver',
    });
    expect(routes.body[0].steps.map((s: { stage: string; reworkTo: string | null }) => [s.stage, s.reworkTo])).toEqual([
      [`pump-clean-${kind.slice(5)}`, null],
      [stage, `pump-clean-${kind.slice(5)}`],
    ]);
    const sig = await Signature.findOne({ where: { entity: 'process_import', entityId: String(draft.body.id) } });
    expect(sig!.printedName).toBe('Test Import Approver');
    const actions = (
      await AuditEvent.findAll({
        where: { entity: 'process_import', entityId: String(draft.body.id) },
        order: [['id', 'ASC']],
      })
    ).map((e) => e.action);
    expect(actions).toEqual(['process_import.drafted', 'process_import.approved']);

    // the same document again adds nothing: everything in it is kept as the plant has it
    const again = await request(t.app).post('/api/process/imports').set('Cookie', author).send(doc);
    expect(again.status).toBe(201);
    expect(again.body.plan).toMatchObject({ partKinds: [], families: [], stages: [], routes: [], kept: 7 });
    const discarded = await request(t.app).post(`/api/process/imports/${again.body.id}/discard`).set('Cookie', author);
    expect(discarded.body.status).toBe('discarded');
  });
});

describe('the demo plant', () => {
  it('came in through one approved import of its process document, signed by a second quality engineer, and the plant exports that process back', async () => {
    const doc = demoProcessDocument();
    const first = (await ProcessImport.findOne({ order: [['id', 'ASC']] }))!;
    expect(first.status).toBe('approved');
    expect(first.document).toEqual(JSON.parse(JSON.stringify(doc)));
    expect(first.approvedById).not.toBe(first.createdById);
    const signature = (await Signature.findOne({ where: { entity: 'process_import', entityId: String(first.id) } }))!;
    expect(signature.meaning).toMatch(/^Approved process import \d+ \(demo seed\)$/);
    expect(signature.userId).toBe(first.approvedById);

    const exported = await request(t.app).get('/api/process/document').set('Cookie', admin);
    expect(exported.status).toBe(200);
    const out = exported.body as typeof doc;
    // other tests add their own things to the shared database: the demo's part of it is compared
    for (const s of doc.stages) expect(out.stages.find((x) => x.code === s.code)).toEqual(s);
    for (const c of doc.characteristics) {
      expect(out.characteristics.find((x) => x.stage === c.stage && x.code === c.code)).toMatchObject({
        kind: c.kind,
        unit: c.unit,
        positions: c.positions,
        defectCode: c.defectCode,
        matesWith: c.matesWith,
      });
    }
    for (const r of doc.routes) {
      const now = out.routes.find((x) => x.family === r.family && x.partKind === r.partKind);
      expect(now?.steps.map((s) => s.stage)).toEqual(r.steps.map((s) => s.stage));
    }
    expect(doc.stages.filter((s) => s.runTest).map((s) => s.code)).toEqual(['run-test']);
  });
});
