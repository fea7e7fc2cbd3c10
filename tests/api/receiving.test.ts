import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Attachment, AuditEvent, PartLot, Supplier, UnitLot } from '../../server/models/index.js';
import { cookieFor, makeTestApp, makeUser, unique, type TestApp } from '../support/app.js';
import { pngImage } from '../support/images.js';
import { finishedParts, lotsFor, plantToday } from '../support/parts.js';
import { certificatePdf } from '../support/pdf.js';

let t: TestApp;
let receiving: string;
let quality: string;
let operator: string;
let supplierId: number;
let otherSupplierId: number;
/** this file's own people: what they write is this file's alone, whatever other files do meanwhile */
let ours: number[];

beforeAll(async () => {
  t = makeTestApp();
  const people = [await makeUser('receiving'), await makeUser('quality'), await makeUser('operator')] as const;
  ours = people.map((p) => p.id);
  receiving = await cookieFor(people[0], t.config);
  quality = await cookieFor(people[1], t.config);
  operator = await cookieFor(people[2], t.config);
  const suppliers = await Supplier.findAll({ order: [['id', 'ASC']] });
  supplierId = suppliers[0]!.id;
  otherSupplierId = suppliers[1]!.id;
});
afterAll(() => t.close());

const post = (cookie: string, url: string, body: object) => request(t.app).post(url).set('Cookie', cookie).send(body);
const get = (cookie: string, url: string) => request(t.app).get(url).set('Cookie', cookie);
const code = (p: string) => `${p}-${unique('').slice(0, 8).toUpperCase()}`;

function lotBody(over: Record<string, unknown> = {}) {
  return {
    supplierId,
    kind: 'rod_bearings',
    partNumber: 'RB-2210',
    lotCode: code('RB'),
    quantity: 48,
    receivedOn: plantToday(),
    inspection: 'accepted',
    ...over,
  };
}

async function uploadCertificate(cookie = receiving) {
  const res = await request(t.app)
    .post('/api/receiving/certificates')
    .set('Cookie', cookie)
    .attach('file', await certificatePdf(), 'coc-rb2210.pdf');
  expect(res.status).toBe(201);
  return res.body.id as number;
}

const writes = async () => ({
  lots: await PartLot.count({ where: { receivedById: ours } }),
  events: await AuditEvent.count({ where: { entity: 'part_lot', actorId: ours } }),
});

describe('receiving a purchased lot', () => {
  it('when receiving logs a lot with its PDF certificate, then it is listed with what is left, its certificate and an audit event', async () => {
    const cert = await uploadCertificate();
    const body = lotBody({ lotCode: code('rb'), certificateAttachmentId: cert, description: 'Rod shells, std' });
    const res = await post(receiving, '/api/receiving/lots', body);
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      kind: 'rod_bearings',
      partNumber: 'RB-2210',
      lotCode: body.lotCode.toUpperCase(), // codes are kept in capitals, as builds and lookups read them
      quantityReceived: 48,
      quantityDrawn: 0,
      quantityLeft: 48,
      receivedOn: plantToday(),
      inspection: 'accepted',
      certificate: { id: cert, mimeType: 'application/pdf', fileName: 'coc-rb2210.pdf' },
      drawable: { ok: true },
      draws: [],
    });
    expect((await Attachment.findByPk(cert))!.entity).toBe('part_lot');
    const events = await AuditEvent.findAll({ where: { entity: 'part_lot', entityId: String(res.body.id) } });
    expect(events.map((e) => e.action)).toEqual(['lot.received']);

    const list = await get(operator, `/api/receiving/lots?q=${encodeURIComponent(body.lotCode)}`);
    expect(list.status).toBe(200);
    expect(list.body.total).toBe(1);
    expect(list.body.rows[0]).toMatchObject({ id: res.body.id, quantityLeft: 48 });
  });

  it('when the certificate is not a PDF by its bytes, then it is refused (415) and nothing is stored', async () => {
    const before = await Attachment.count({ where: { uploadedById: ours } });
    const res = await request(t.app)
      .post('/api/receiving/certificates')
      .set('Cookie', receiving)
      .attach('file', pngImage(), 'coc.pdf');
    expect(res.status).toBe(415);
    expect(res.body.error.code).toBe('not_a_pdf');
    expect(await Attachment.count({ where: { uploadedById: ours } })).toBe(before);
  });

  it('when the same lot code of the same part number from the same supplier comes again, then it is refused; another part number may share it, and the screens say which', async () => {
    const lotCode = code('LC');
    const first = await post(receiving, '/api/receiving/lots', lotBody({ lotCode }));
    expect(first.status).toBe(201);
    const before = await writes();
    const again = await post(receiving, '/api/receiving/lots', lotBody({ lotCode: lotCode.toLowerCase() }));
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('lot_exists');
    expect(again.body.error.message).toMatch(`Lot ${lotCode} of part number RB-2210`);
    expect(again.body.error.fields.lotCode).toBe('Already received for part number RB-2210.');
    expect(await writes()).toEqual(before);

    const mains = await post(
      receiving,
      '/api/receiving/lots',
      lotBody({ lotCode, kind: 'main_bearings', partNumber: 'MB-7700' }),
    );
    expect(mains.status).toBe(201);
    const elsewhere = await post(receiving, '/api/receiving/lots', lotBody({ lotCode, supplierId: otherSupplierId }));
    expect(elsewhere.status).toBe(201);
    const mainsNow = await get(receiving, `/api/receiving/lots/${mains.body.id}`);
    expect(mainsNow.body.sameCode.map((s: { partNumber: string }) => s.partNumber)).toEqual(['RB-2210', 'RB-2210']);
    const list = await get(receiving, `/api/receiving/lots?q=${lotCode}`);
    expect(list.body.total).toBe(3);
    const rb = list.body.rows.find((r: { id: number }) => r.id === first.body.id);
    expect(rb.sameCode).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ partNumber: 'MB-7700' }),
        expect.objectContaining({ partNumber: 'RB-2210' }),
      ]),
    );
  });

  it('when a concern names a lot code one supplier uses on two part numbers, then it asks which, naming both; with the part number it holds that lot alone', async () => {
    const lotCode = code('SH');
    const rods = await post(receiving, '/api/receiving/lots', lotBody({ lotCode }));
    const mains = await post(
      receiving,
      '/api/receiving/lots',
      lotBody({ lotCode, kind: 'main_bearings', partNumber: 'MB-7700' }),
    );
    expect([rods.status, mains.status]).toEqual([201, 201]);
    const supplier = (await Supplier.findByPk(supplierId))!;
    const concern = {
      lotCode,
      description: 'Scored shells straight out of the box',
      severity: 'major',
      defectCode: 'LOT',
    };
    const before = await AuditEvent.count({ where: { entity: 'nonconformance' } });
    const ask = await post(operator, '/api/ncrs', concern);
    expect(ask.status).toBe(400);
    expect(ask.body.error.message).toBe(
      `Lot code ${lotCode} is on more than one part number (part number RB-2210 from ${supplier.name}; part number MB-7700 from ${supplier.name}): give the part number.`,
    );
    expect(ask.body.error.fields.partNumber).toBe('One of RB-2210, MB-7700.');
    expect(await AuditEvent.count({ where: { entity: 'nonconformance' } })).toBe(before);
    const raised = await post(operator, '/api/ncrs', { ...concern, partNumber: 'mb-7700' });
    expect(raised.status).toBe(201);
    expect(raised.body.lot).toMatchObject({ lotCode, partNumber: 'MB-7700' });
    const held = await get(receiving, `/api/receiving/lots/${mains.body.id}`);
    expect(held.body.drawable).toEqual({
      ok: false,
      why: `Lot ${lotCode} (part number MB-7700) is held by ${raised.body.number}.`,
    });
    expect((await get(receiving, `/api/receiving/lots/${rods.body.id}`)).body.drawable).toEqual({ ok: true });
  });

  it('when the input is wrong, then each problem is a 400 on its field and nothing is written', async () => {
    const before = await writes();
    const cases: [Record<string, unknown>, string][] = [
      [{ inspection: 'on_hold' }, 'reason'], // held without a reason
      [{ inspection: 'refused', reason: 'no' }, 'reason'],
      [{ quantity: 0 }, 'quantity'],
      [{ quantity: 2.5 }, 'quantity'],
      [{ oversizeIn: 0.02 }, 'oversizeIn'], // rod bearings have no oversize
      [{ lotCode: '  ' }, 'lotCode'],
      [{ lotCode: '<script>' }, 'lotCode'],
      [{ receivedOn: '2026-02-30' }, 'receivedOn'],
      [{ kind: 'spark_plugs' }, 'kind'],
      [{ supplierId: 2147483647 }, 'supplierId'],
      [{ receivedOn: '2099-01-01' }, 'receivedOn'], // after today at the plant
      [{ certificateAttachmentId: 2147483647 }, 'certificateAttachmentId'],
    ];
    for (const [over, field] of cases) {
      const res = await post(receiving, '/api/receiving/lots', lotBody(over));
      expect(res.status, JSON.stringify(over)).toBe(400);
      expect(Object.keys(res.body.error.fields ?? {}), JSON.stringify(over)).toContain(field);
    }
    // another person's upload cannot be claimed
    const theirs = await uploadCertificate(await cookieFor(await makeUser('receiving'), t.config));
    const claimed = await post(receiving, '/api/receiving/lots', lotBody({ certificateAttachmentId: theirs }));
    expect(claimed.status).toBe(400);
    expect(await writes()).toEqual(before);
    // the floor reads lots but does not receive them
    expect((await post(operator, '/api/receiving/lots', lotBody())).status).toBe(403);
  });
});

describe('inspection and drawing at build', () => {
  it('when a lot waits for inspection, is on hold or refused, then a build cannot draw from it and says why; once accepted it can, and the lot counts what is left', async () => {
    const tag = code('B');
    const lots = await lotsFor(0.0197, tag);
    const rings = lots.find((l) => l.kind === 'rings')!;
    // the rings come from a lot received today, still waiting for inspection
    const ringCode = code('RG');
    const received = await post(receiving, '/api/receiving/lots', {
      supplierId: rings.supplierId,
      kind: 'rings',
      partNumber: 'RG-5150',
      lotCode: ringCode,
      quantity: 3,
      receivedOn: plantToday(),
    });
    expect(received.body).toMatchObject({ inspection: 'pending', drawable: { ok: false } });
    const lotId = received.body.id as number;
    const withRings = lots.map((l) =>
      l.kind === 'rings' ? { ...l, partNumber: 'RG-5150', lotCode: ringCode, quantity: 2 } : l,
    );
    const parts = await finishedParts(t, { receiving, operator }, 'TARN-6');
    const build = () =>
      post(operator, '/api/units', {
        family: 'TARN-6',
        block: parts.block,
        crankshaft: parts.crankshaft,
        heads: parts.heads,
        lots: withRings,
      });
    const field = `lots.${lots.indexOf(rings)}.lotCode`;

    const waiting = await build();
    expect(waiting.status).toBe(409);
    expect(waiting.body.error.fields[field]).toBe(
      `Lot ${ringCode} (part number RG-5150) is waiting for its receiving inspection. Use another lot.`,
    );
    const hold = await post(quality, `/api/receiving/lots/${lotId}/inspection`, {
      inspection: 'on_hold',
      reason: 'Gap spec on the certificate does not match the drawing',
    });
    expect(hold.status).toBe(200);
    const held = await build();
    expect(held.body.error.fields[field]).toBe(
      `Lot ${ringCode} (part number RG-5150) is on hold at receiving: Gap spec on the certificate does not match the drawing Use another lot.`,
    );
    await post(quality, `/api/receiving/lots/${lotId}/inspection`, {
      inspection: 'refused',
      reason: 'Supplier confirms wrong gap',
    });
    expect((await build()).body.error.fields[field]).toMatch(/was refused at receiving: Supplier confirms wrong gap/);
    expect(await UnitLot.count({ where: { partLotId: lotId } })).toBe(0);

    const accepted = await post(receiving, `/api/receiving/lots/${lotId}/inspection`, {
      inspection: 'accepted',
      reason: 'Supplier sent the corrected certificate',
    });
    expect(accepted.body).toMatchObject({ inspection: 'accepted', drawable: { ok: true } });
    const built = await build();
    expect(built.status).toBe(201);
    const after = await get(receiving, `/api/receiving/lots/${lotId}`);
    // 3 received − 2 drawn = 1 left
    expect(after.body).toMatchObject({ quantityReceived: 3, quantityDrawn: 2, quantityLeft: 1 });
    expect(after.body.draws).toEqual([expect.objectContaining({ unit: built.body.serial, quantity: 2 })]);
    const events = await AuditEvent.findAll({
      where: { entity: 'part_lot', entityId: String(lotId) },
      order: [['id', 'ASC']],
    });
    expect(events.map((e) => e.action)).toEqual([
      'lot.received',
      'lot.inspected',
      'lot.inspected',
      'lot.inspected',
      'lot.drawn',
    ]);
    expect(events.at(-1)!.after).toMatchObject({ quantityDrawn: 2, quantityLeft: 1, unit: built.body.serial });

    // the one ring set left is not enough for the next unit's two
    const next = await finishedParts(t, { receiving, operator }, 'TARN-6');
    const short = await post(operator, '/api/units', {
      family: 'TARN-6',
      block: next.block,
      crankshaft: next.crankshaft,
      heads: next.heads,
      lots: withRings,
    });
    expect(short.status).toBe(409);
    expect(short.body.error.fields[field]).toBe(
      `Lot ${ringCode} (part number RG-5150) has only 1 left, not 2. Use another lot.`,
    );
  });

  it('when a build names a lot nobody received, then it says so plainly, naming the part number it was received for', async () => {
    const tag = code('N');
    const lots = await lotsFor(0.0197, tag);
    const parts = await finishedParts(t, { receiving, operator }, 'TARN-6');
    const i = lots.findIndex((l) => l.kind === 'gasket_set');
    const res = await post(operator, '/api/units', {
      family: 'TARN-6',
      block: parts.block,
      crankshaft: parts.crankshaft,
      heads: parts.heads,
      lots: lots.map((l, k) => (k === i ? { ...l, partNumber: 'GS-NEVER' } : l)),
    });
    expect(res.status).toBe(409);
    const supplier = (await Supplier.findByPk(lots[i]!.supplierId))!;
    expect(res.body.error.fields[`lots.${i}.lotCode`]).toBe(
      `Lot ${lots[i]!.lotCode} from ${supplier.name} was received for part number ${lots[i]!.partNumber}, not GS-NEVER.`,
    );
    const none = await post(operator, '/api/units', {
      family: 'TARN-6',
      block: parts.block,
      crankshaft: parts.crankshaft,
      heads: parts.heads,
      lots: lots.map((l, k) => (k === i ? { ...l, lotCode: `${tag}-NOPE` } : l)),
    });
    expect(none.body.error.fields[`lots.${i}.lotCode`]).toBe(
      `No lot ${tag}-NOPE of part number ${lots[i]!.partNumber} from ${supplier.name} has been received: receiving logs it before it can be built in.`,
    );
  });

  it('when an inspection is set to what it already is, or without a reason, then it is refused and nothing is written', async () => {
    const res = await post(receiving, '/api/receiving/lots', lotBody());
    const before = await writes();
    const same = await post(quality, `/api/receiving/lots/${res.body.id}/inspection`, {
      inspection: 'accepted',
      reason: 'Looks fine again',
    });
    expect(same.status).toBe(409);
    expect(
      (await post(quality, `/api/receiving/lots/${res.body.id}/inspection`, { inspection: 'on_hold' })).status,
    ).toBe(400);
    expect(
      (
        await post(quality, `/api/receiving/lots/2147483647/inspection`, {
          inspection: 'on_hold',
          reason: 'Nobody has it',
        })
      ).status,
    ).toBe(404);
    expect(
      (
        await post(operator, `/api/receiving/lots/${res.body.id}/inspection`, {
          inspection: 'on_hold',
          reason: 'Not mine to say',
        })
      ).status,
    ).toBe(403);
    expect(await writes()).toEqual(before);
  });
});
