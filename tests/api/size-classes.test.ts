import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { passingReadings } from '../../db/seeders/sample-readings.js';
import { buildRecordContent } from '../../server/documents/content.js';
import { Characteristic, Item, StageResult, ToleranceRule } from '../../server/models/index.js';
import type { RuleJson } from '../../shared/schemas/spec.js';
import { TEST_PASSWORD, cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';
import { formFor, gaugesOf, lotsFor, passThrough, tornDownCore, HEAD_STATIONS } from '../support/parts.js';

let t: TestApp;
let cookies: { receiving: string; operator: string };
let quality: string;
let approver: string;

beforeAll(async () => {
  t = makeTestApp();
  cookies = {
    receiving: await cookieFor(await makeUser('receiving'), t.config),
    operator: await cookieFor(await makeUser('operator'), t.config),
  };
  quality = await cookieFor(await makeUser('quality'), t.config);
  approver = await cookieFor(await makeUser('quality'), t.config);
});
afterAll(() => t.close());

// TARN-6 is bored in metric steps from 94 mm, its rule in inches: 1 in = 25.4 mm exactly (NIST SP 811)
const BORE_PLUS_025_IN = 3.7106; // 94.25 mm ÷ 25.4 = 3.710 63 in, to the rule's 0.0001 in
const STANDARD_BORE_IN = 94 / 25.4; // the family's standard bore, 3.700 79 in

/** Records a result with the size classes chosen and the measured values of some characteristics set. */
async function record(
  station: string,
  serial: string,
  sizeClasses: Record<string, string>,
  values = {} as Record<string, number>,
) {
  const form = await formFor(t, cookies.operator, station, serial);
  return request(t.app)
    .post('/api/results')
    .set('Cookie', cookies.operator)
    .send({
      idempotencyKey: randomUUID(),
      serial,
      station,
      ...gaugesOf(form),
      sizeClasses,
      readings: passingReadings(form, (c, _p, v) => values[c] ?? v),
    });
}

describe('size classes', () => {
  it('when the demo spec book is read, then the bore and the main journals carry their classes with their limits', async () => {
    const book = await request(t.app).get('/api/spec/book').query({ family: 'TARN-6' }).set('Cookie', quality);
    expect(book.status).toBe(200);
    const all = (book.body.stages as { characteristics: { code: string; inForce: RuleJson | null }[] }[]).flatMap(
      (s) => s.characteristics,
    );
    const bore = all.find((c) => c.code === 'bore')!.inForce!;
    expect(bore.sizeClasses.map((k) => k.code)).toEqual(['STD', '+0.25', '+0.50']);
    // +0.25 mm: 3.7106 ± 0.0005 in
    expect(bore.sizeClasses[1]).toMatchObject({ nominal: 3.7106, lower: 3.7101, upper: 3.7111 });
    const journal = all.find((c) => c.code === 'main-journal')!.inForce!;
    expect(journal.sizeClasses.map((k) => k.code)).toEqual(['STD', '-0.010', '-0.020']);
  });

  it('when a rule version with size classes is drafted, then it is approved by another person and fixed with its classes', async () => {
    const bore = { characteristicId: (await Characteristic.findOne({ where: { code: 'bore' } }))!.id };
    const limits = {
      limitType: 'nominal',
      nominal: 3.7205,
      minusTol: 0.0005,
      plusTol: 0.0005,
      resolution: 0.0001,
      sizeClasses: [
        { code: 'STD', name: 'Standard', nominal: 3.7008, minusTol: 0.0005, plusTol: 0.0005 },
        { code: 'std', name: 'Again', nominal: 3.71, minusTol: -1, plusTol: 0.0005 },
      ],
    };
    const bad = await request(t.app)
      .post('/api/spec/rules')
      .set('Cookie', quality)
      .send({ family: 'TARN-6', characteristicId: bore.characteristicId, limits });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields)).toEqual(
      expect.arrayContaining(['limits.sizeClasses.1.code', 'limits.sizeClasses.1.minusTol']),
    );
    // a family of its own, so the demo's rules stay as they are for the other tests
    const family = await request(t.app)
      .post('/api/engine-families')
      .set('Cookie', await cookieFor(await makeUser('admin'), t.config))
      .send({
        code: `SC-${randomUUID().slice(0, 6).toUpperCase()}`,
        name: 'Size class family',
        layout: 'inline',
        cylinders: 4,
        boreMm: 94,
        strokeMm: 86,
        headsPerEngine: 1,
        warrantyMonths: 12,
        warrantyKm: null,
      });
    expect(family.status).toBe(201);
    limits.sizeClasses = [
      limits.sizeClasses[0]!,
      { code: '+0.50', name: '0.50 mm over', nominal: 3.7205, minusTol: 0.0005, plusTol: 0.0005 },
    ];
    const draft = await request(t.app)
      .post('/api/spec/rules')
      .set('Cookie', quality)
      .send({ family: family.body.code, characteristicId: bore.characteristicId, limits });
    expect(draft.status).toBe(201);
    expect(draft.body.sizeClasses.map((k: { code: string }) => k.code)).toEqual(['STD', '+0.50']);
    const own = await request(t.app)
      .post(`/api/spec/rules/${draft.body.id}/approve`)
      .set('Cookie', quality)
      .send({ reason: 'Oversize steps for the family', password: TEST_PASSWORD });
    expect(own.status).toBe(403);
    const ok = await request(t.app)
      .post(`/api/spec/rules/${draft.body.id}/approve`)
      .set('Cookie', approver)
      .send({ reason: 'Oversize steps for the family', password: TEST_PASSWORD });
    expect(ok.status).toBe(200);
    expect(ok.body.sizeClasses[1]).toMatchObject({ code: '+0.50', lower: 3.72, upper: 3.721 });
    // the database keeps an approved version's classes as they were signed
    await expect(ToleranceRule.update({ sizeClasses: [] }, { where: { id: draft.body.id } })).rejects.toThrow(
      /cannot be edited/,
    );
  });

  it('when the station chooses a class, then the readings are judged to its limits, and the build matches pistons and bearings to the classes', async () => {
    const parts = await tornDownCore(t, cookies, 'TARN-6');
    await passThrough(t, cookies.operator, ['CLN-1', 'MPI-1', 'PT-1', 'LH-1'], parts.block);
    const form = await formFor(t, cookies.operator, 'BH-1', parts.block);
    expect(form.characteristics.find((c) => c.code === 'bore')!.sizeClasses!.map((k) => k.code)).toEqual([
      'STD',
      '+0.25',
      '+0.50',
    ]);

    const before = await StageResult.count({
      where: { itemId: (await Item.findOne({ where: { serial: parts.block } }))!.id },
    });
    const unknown = await record(
      'BH-1',
      parts.block,
      { bore: '+0.75', 'bore-finish': 'STD' },
      { bore: BORE_PLUS_025_IN },
    );
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.fields).toEqual({
      'sizeClasses.bore': 'Cylinder bore diameter has no size class +0.75: choose one of STD, +0.25, +0.50.',
      'sizeClasses.bore-finish': 'Bore surface finish Ra has no size classes: leave it out.',
    });
    // measured with no class chosen: refused, since the build matches pistons to the class
    const none = await record('BH-1', parts.block, {}, { bore: BORE_PLUS_025_IN });
    expect(none.status).toBe(400);
    expect(none.body.error.fields).toEqual({
      'sizeClasses.bore': 'Cylinder bore diameter: choose the size class it was finished to (STD, +0.25, +0.50).',
    });
    expect(
      await StageResult.count({ where: { itemId: (await Item.findOne({ where: { serial: parts.block } }))!.id } }),
    ).toBe(before);

    const bored = await record('BH-1', parts.block, { bore: '+0.25' }, { bore: BORE_PLUS_025_IN });
    expect(bored.status).toBe(201);
    expect(bored.body.verdict).toBe('pass');
    expect(bored.body.sizeClasses.bore).toMatchObject({ code: '+0.25', name: '0.25 mm over (94.25 mm)' });
    const reading = (bored.body.readings as { characteristic: string; lower: number; upper: number }[]).find(
      (r) => r.characteristic === 'bore',
    )!;
    // judged to the +0.25 class (3.7106 ± 0.0005 in), not the rule's own +0.50 limits
    expect([reading.lower, reading.upper]).toEqual([3.7101, 3.7111]);
    await passThrough(t, cookies.operator, ['DK-1', 'WSH-1'], parts.block);

    await passThrough(t, cookies.operator, ['CLN-2', 'MPI-2'], parts.crankshaft);
    const ground = await record('CG-1', parts.crankshaft, { 'main-journal': '-0.010' });
    expect(ground.status).toBe(201);
    expect(ground.body.verdict).toBe('pass');
    for (const h of parts.heads) await passThrough(t, cookies.operator, HEAD_STATIONS, h);

    // pistons made for the bore the block was finished to: the mean bore less the standard, in inches
    const lots = await lotsFor(Number((BORE_PLUS_025_IN - STANDARD_BORE_IN).toFixed(4)), 'SIZE', {});
    const withClasses = (pistons: string | undefined, bearings: string | undefined) =>
      lots.map((l) =>
        l.kind === 'pistons' && pistons
          ? { ...l, sizeClass: pistons }
          : l.kind === 'main_bearings' && bearings
            ? { ...l, sizeClass: bearings }
            : l,
      );
    const units = await Item.count({ where: { kind: 'long_block' } });
    const build = (body: object) =>
      request(t.app)
        .post('/api/units')
        .set('Cookie', cookies.operator)
        .send({ family: 'TARN-6', block: parts.block, crankshaft: parts.crankshaft, heads: parts.heads, ...body });
    const wrong = await build({ lots: withClasses('+0.50', undefined) });
    expect(wrong.status).toBe(409);
    const pi = lots.findIndex((l) => l.kind === 'pistons');
    const bi = lots.findIndex((l) => l.kind === 'main_bearings');
    expect(wrong.body.error.fields).toEqual({
      [`lots.${pi}.sizeClass`]: `The pistons are size class +0.50, but ${parts.block}'s cylinder bore diameter was finished to 0.25 mm over (94.25 mm) (+0.25): use pistons of class +0.25.`,
      [`lots.${bi}.sizeClass`]: `${parts.crankshaft}'s main journal diameter was finished to 0.010 in under (-0.010): say which size class the main bearings are.`,
    });
    expect(await Item.count({ where: { kind: 'long_block' } })).toBe(units);

    const built = await build({ lots: withClasses('+0.25', '-0.010') });
    expect(built.status).toBe(201);
    const record_ = await buildRecordContent(t.sequelize, built.body.serial, null);
    const lotNotes = Object.fromEntries(record_.lots.map((l) => [l.kind, l.note]));
    expect([lotNotes.Pistons, lotNotes['Main bearings']]).toEqual(['+0.25', '-0.010']);
    const notes = record_.stages.map((s) => s.note).filter(Boolean);
    expect(notes).toEqual(
      expect.arrayContaining([
        'size class Cylinder bore diameter: 0.25 mm over (94.25 mm) (+0.25)',
        'size class Main journal diameter: 0.010 in under (-0.010)',
      ]),
    );
  });
});
