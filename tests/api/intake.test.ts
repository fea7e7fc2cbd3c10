import jsQR from 'jsqr';
import { PNG } from 'pngjs';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseSerial } from '../../shared/domain/serial.js';
import { AuditEvent, Customer, EngineFamily, Item, ItemLink, LabelPrint, Supplier } from '../../server/models/index.js';
import { cookieFor, makeTestApp, makeUser, unique, type TestApp } from '../support/app.js';
import { pngImage } from '../support/images.js';

let t: TestApp;
let receiving: string;
let operator: string;
let warranty: string;
let v8: EngineFamily;
let inline6: EngineFamily;
let customerId: number;
let supplierId: number;

beforeAll(async () => {
  t = makeTestApp();
  receiving = await cookieFor(await makeUser('receiving'), t.config);
  operator = await cookieFor(await makeUser('operator'), t.config);
  warranty = await cookieFor(await makeUser('warranty'), t.config);
  v8 = (await EngineFamily.findOne({ where: { code: 'CORRIE-8' } }))!;
  inline6 = (await EngineFamily.findOne({ where: { code: 'TARN-6' } }))!;
  customerId = (await Customer.findOne())!.id;
  supplierId = (await Supplier.findOne())!.id;
});
afterAll(() => t.close());

const today = () => new Date().toISOString().slice(0, 10);
const customerReturn = (over: Record<string, unknown> = {}) => ({
  familyId: v8.id,
  castingNumber: `CX ${unique('').slice(0, 6).toUpperCase()}`,
  idNumber: unique('ID').toUpperCase(),
  source: 'customer_return',
  customerId,
  sourceReference: unique('RMA-'),
  receivedOn: today(),
  complete: true,
  grade: 'sound',
  accepted: true,
  creditDecision: 'full',
  ...over,
});

async function upload(cookie = receiving) {
  const res = await request(t.app)
    .post('/api/attachments')
    .set('Cookie', cookie)
    .attach('file', pngImage(), 'dock.png');
  expect(res.status).toBe(201);
  return res.body.id as number;
}

describe('receiving a core', () => {
  it('when receiving logs a customer return with two photos, then it gets a valid core serial, its photos and an audit event', async () => {
    const photoIds = [await upload(), await upload()];
    const res = await request(t.app).post('/api/cores').set('Cookie', receiving).send(customerReturn({ photoIds }));
    expect(res.status).toBe(201);
    expect(parseSerial(res.body.serial)).toMatchObject({ ok: true, kind: 'core' });
    expect(res.body.status).toBe('received');
    expect(res.body.currentStage.code).toBe('teardown');
    expect(res.body.photos).toHaveLength(2);
    expect(res.body.receipt).toMatchObject({ source: 'customer_return', creditDecision: 'full', accepted: true });
    const events = await AuditEvent.findAll({ where: { entity: 'item', entityId: res.body.serial } });
    expect(events.map((e) => e.action)).toEqual(['core.received']);
    const photo = await request(t.app).get(res.body.photos[0].url).set('Cookie', warranty);
    expect(photo.status).toBe(200);
    expect(photo.headers['content-type']).toBe('image/png');
    expect(photo.headers['x-content-type-options']).toBe('nosniff');
  });

  it('when a core is rejected, then it keeps its record and reason; a reason is required', async () => {
    const bad = await request(t.app)
      .post('/api/cores')
      .set('Cookie', receiving)
      .send(customerReturn({ accepted: false }));
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty('rejectReason');
    const res = await request(t.app)
      .post('/api/cores')
      .set('Cookie', receiving)
      .send(
        customerReturn({
          accepted: false,
          rejectReason: 'Block holed by a thrown rod',
          grade: 'unusable',
          creditDecision: 'none',
          creditReason: 'Core not rebuildable',
          damage: ['broken'],
        }),
      );
    expect(res.status).toBe(201);
    expect(res.body.status).toBe('rejected');
    expect(res.body.currentStage).toBeNull();
    expect(res.body.route.map((r: { code: string; state: string }) => [r.code, r.state])).toEqual([
      ['intake', 'done'],
      ['teardown', 'skipped'],
    ]);
    const again = await request(t.app).get(`/api/cores/${res.body.serial}`).set('Cookie', receiving);
    expect(again.body.receipt.rejectReason).toBe('Block holed by a thrown rod');
  });

  it('asks for the credit decision on a customer return and the supplier on a purchase', async () => {
    let res = await request(t.app)
      .post('/api/cores')
      .set('Cookie', receiving)
      .send(customerReturn({ creditDecision: undefined }));
    expect(res.body.error.fields).toHaveProperty('creditDecision');
    res = await request(t.app)
      .post('/api/cores')
      .set('Cookie', receiving)
      .send(customerReturn({ creditDecision: 'partial' }));
    expect(res.body.error.fields).toHaveProperty('creditReason');
    res = await request(t.app)
      .post('/api/cores')
      .set('Cookie', receiving)
      .send(customerReturn({ source: 'purchased', customerId: undefined, creditDecision: undefined }));
    expect(res.body.error.fields).toHaveProperty('supplierId');
    res = await request(t.app)
      .post('/api/cores')
      .set('Cookie', receiving)
      .send(customerReturn({ source: 'purchased', customerId: undefined, creditDecision: undefined, supplierId }));
    expect(res.status).toBe(201);
    expect(res.body.receipt.supplier.id).toBe(supplierId);
  });

  it('when the ID number was seen on a recent core, then 409 with a link to it, and a confirmed second record', async () => {
    const first = await request(t.app).post('/api/cores').set('Cookie', receiving).send(customerReturn());
    const idNumber = first.body.receipt.idNumber as string;
    const second = await request(t.app).post('/api/cores').set('Cookie', receiving).send(customerReturn({ idNumber }));
    expect(second.status).toBe(409);
    expect(second.body.error.reason).toBe('possible_duplicate');
    expect(second.body.error.duplicates[0].serial).toBe(first.body.serial);
    const lookup = await request(t.app)
      .get(`/api/cores/duplicates?castingNumber=X123&idNumber=${encodeURIComponent(idNumber.toLowerCase())}`)
      .set('Cookie', receiving);
    expect(lookup.body.map((d: { serial: string }) => d.serial)).toContain(first.body.serial);
    const confirmed = await request(t.app)
      .post('/api/cores')
      .set('Cookie', receiving)
      .send(customerReturn({ idNumber, confirmNotDuplicate: true }));
    expect(confirmed.status).toBe(201);
  });

  it("refuses a photo that is not the uploader's or does not exist, and writes nothing", async () => {
    const other = await upload(operator);
    const body = customerReturn({ photoIds: [other] });
    const res = await request(t.app).post('/api/cores').set('Cookie', receiving).send(body);
    expect(res.status).toBe(400);
    const log = await request(t.app)
      .get(`/api/cores?q=${encodeURIComponent(body.sourceReference as string)}`)
      .set('Cookie', receiving);
    expect(log.body.total).toBe(0);
  });
});

describe('intake rules found by trying it', () => {
  it('reports every problem at once, cross-field rules included, even when a field is also wrong', async () => {
    const res = await request(t.app)
      .post('/api/cores')
      .set('Cookie', receiving)
      .send(customerReturn({ castingNumber: '', creditDecision: undefined, customerId: undefined, accepted: false }));
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual([
      'castingNumber',
      'creditDecision',
      'customerId',
      'rejectReason',
    ]);
  });

  it('refuses a received date in the future or long ago, and full credit on a rejected core', async () => {
    const future = new Date(Date.now() + 3 * 86_400_000).toISOString().slice(0, 10);
    let res = await request(t.app)
      .post('/api/cores')
      .set('Cookie', receiving)
      .send(customerReturn({ receivedOn: future }));
    expect(res.body.error.fields).toHaveProperty('receivedOn');
    res = await request(t.app)
      .post('/api/cores')
      .set('Cookie', receiving)
      .send(customerReturn({ receivedOn: '1901-05-01' }));
    expect(res.body.error.fields).toHaveProperty('receivedOn');
    res = await request(t.app)
      .post('/api/cores')
      .set('Cookie', receiving)
      .send(customerReturn({ accepted: false, rejectReason: 'Holed block' }));
    expect(res.body.error.fields).toEqual({ creditDecision: 'A rejected core cannot get full core credit.' });
  });

  it('treats "LV 208-113" and "LV208113" as the same stamped ID number, and finds serials typed without dashes', async () => {
    const base = unique('').toUpperCase().slice(0, 6);
    const first = await request(t.app)
      .post('/api/cores')
      .set('Cookie', receiving)
      .send(customerReturn({ idNumber: `LV ${base}-9` }));
    expect(first.status).toBe(201);
    const again = await request(t.app)
      .post('/api/cores')
      .set('Cookie', receiving)
      .send(customerReturn({ idNumber: `LV${base}9` }));
    expect(again.status).toBe(409);
    expect(again.body.error.duplicates[0].serial).toBe(first.body.serial);
    const compact = (first.body.serial as string).replace(/-/g, '');
    const log = await request(t.app).get(`/api/cores?q=${compact}`).set('Cookie', receiving);
    expect(log.body.rows.map((r: { serial: string }) => r.serial)).toEqual([first.body.serial]);
  });

  it('refuses to keep a part that intake recorded as missing', async () => {
    const res = await request(t.app)
      .post('/api/cores')
      .set('Cookie', receiving)
      .send(
        customerReturn({
          complete: false,
          missing: ['crankshaft'],
          creditDecision: 'partial',
          creditReason: 'Came without its crankshaft',
        }),
      );
    expect(res.status).toBe(201);
    const bad = await request(t.app)
      .post(`/api/cores/${res.body.serial}/teardown`)
      .set('Cookie', operator)
      .send({ kept: [{ kind: 'block' }, { kind: 'crankshaft' }] });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/recorded the crankshaft as missing/);
    // the operator, who may not read the receipt, still sees what intake found missing
    const asItem = await request(t.app).get(`/api/items/${res.body.serial}`).set('Cookie', operator);
    expect(asItem.body.intakeCondition).toEqual({ complete: false, missing: ['crankshaft'], damage: [] });
    expect(asItem.body).not.toHaveProperty('receipt');
    const good = await request(t.app)
      .post(`/api/cores/${res.body.serial}/teardown`)
      .set('Cookie', operator)
      .send({ kept: [{ kind: 'block' }] });
    expect(good.status).toBe(201);
    expect(good.body.teardown.by).toBe('Test operator');
  });
});

describe('the intake log', () => {
  const tag = unique('LOG-').toUpperCase();
  beforeAll(async () => {
    for (const [i, grade] of (['sound', 'doubtful', 'workable'] as const).entries()) {
      const res = await request(t.app)
        .post('/api/cores')
        .set('Cookie', receiving)
        .send(
          customerReturn({
            familyId: i === 2 ? inline6.id : v8.id,
            grade,
            sourceReference: `=${tag}-${i}`,
          }),
        );
      expect(res.status).toBe(201);
    }
  });

  it('filters, sorts and pages on the server; grade sorts by condition, best first', async () => {
    let res = await request(t.app).get(`/api/cores?q=${tag}&sort=grade&dir=asc`).set('Cookie', receiving);
    expect(res.body.rows.map((r: { grade: string }) => r.grade)).toEqual(['sound', 'workable', 'doubtful']);
    res = await request(t.app).get(`/api/cores?q=${tag}&family=${v8.id}&sort=grade&dir=asc`).set('Cookie', receiving);
    expect(res.body.total).toBe(2);
    expect(res.body.rows.map((r: { grade: string }) => r.grade)).toEqual(['sound', 'doubtful']);
    res = await request(t.app)
      .get(`/api/cores?q=${tag}&pageSize=1&page=2&sort=serial&dir=desc`)
      .set('Cookie', receiving);
    expect(res.body.rows).toHaveLength(1);
    expect(res.body.total).toBe(3);
    res = await request(t.app).get(`/api/cores?q=${tag}&from=2000-01-01&to=2000-12-31`).set('Cookie', receiving);
    expect(res.body.total).toBe(0);
    res = await request(t.app).get('/api/cores?sort=price').set('Cookie', receiving);
    expect(res.status).toBe(400);
  });

  it('exports CSV with every matching row, formulas neutralised', async () => {
    const res = await request(t.app).get(`/api/cores/export.csv?q=${tag}`).set('Cookie', warranty);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    const lines = res.text.trim().split('\r\n');
    expect(lines).toHaveLength(4);
    // every export starts with the UTF-8 byte-order mark (shared/csv.ts); trim() above drops it
    expect(res.text.startsWith('\ufeffserial,')).toBe(true);
    expect(lines[0]).toMatch(/^serial,family,casting_number/);
    expect(res.text).toContain(`'=${tag}-0`);
    expect(res.text).not.toContain(`,=${tag}`);
  });

  it('warranty reads the log but cannot log a core', async () => {
    expect((await request(t.app).get('/api/cores').set('Cookie', warranty)).status).toBe(200);
    expect((await request(t.app).post('/api/cores').set('Cookie', warranty).send(customerReturn())).status).toBe(403);
  });
});

describe('teardown', () => {
  async function receivedCore(familyId = v8.id) {
    const res = await request(t.app).post('/api/cores').set('Cookie', receiving).send(customerReturn({ familyId }));
    return res.body.serial as string;
  }
  const v8Parts = {
    kept: [
      { kind: 'block' },
      { kind: 'crankshaft' },
      { kind: 'cylinder_head', position: 'left' },
      { kind: 'cylinder_head', position: 'right' },
    ],
    scrapped: [{ kind: 'camshaft', reason: 'Lobes worn through' }],
  };

  it('when a V8 core is torn down, then block, crank and two heads get serials, links to the core and their first stage', async () => {
    const serial = await receivedCore();
    const res = await request(t.app).post(`/api/cores/${serial}/teardown`).set('Cookie', operator).send(v8Parts);
    expect(res.status).toBe(201);
    expect(res.body.status).toBe('torn_down');
    expect(res.body.parts.map((p: { kind: string }) => p.kind).sort()).toEqual([
      'block',
      'crankshaft',
      'cylinder_head',
      'cylinder_head',
    ]);
    expect(res.body.teardown.scrapped).toEqual([{ kind: 'camshaft', reason: 'Lobes worn through' }]);
    expect(res.body.teardown.discardedByRule).toContain('pistons');
    const block = res.body.parts.find((p: { kind: string }) => p.kind === 'block');
    expect(parseSerial(block.serial)).toMatchObject({ ok: true, kind: 'block' });
    const item = await request(t.app)
      .get(`/api/items/${block.serial.toLowerCase().replace(/-/g, ' ')}`)
      .set('Cookie', operator);
    expect(item.status).toBe(200);
    expect(item.body.harvestedFrom).toEqual({ serial, kind: 'core' });
    expect(item.body.currentStage.code).toBe('block-clean');
    expect(item.body.route[0]).toMatchObject({ code: 'block-clean', state: 'current' });
    const heads = res.body.parts.filter((p: { kind: string }) => p.kind === 'cylinder_head');
    expect(heads.map((h: { positionLabel: string }) => h.positionLabel).sort()).toEqual(['left', 'right']);
    const core = await Item.findOne({ where: { serial } });
    expect(await ItemLink.count({ where: { parentItemId: core!.id, linkType: 'harvested_from' } })).toBe(4);
  });

  it('refuses a second head on an inline six, unnamed heads on a V, a second teardown and a rejected core', async () => {
    const six = await receivedCore(inline6.id);
    let res = await request(t.app)
      .post(`/api/cores/${six}/teardown`)
      .set('Cookie', operator)
      .send({ kept: [{ kind: 'cylinder_head' }, { kind: 'cylinder_head' }] });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/has 1 cylinder head, not 2/);
    const v = await receivedCore();
    res = await request(t.app)
      .post(`/api/cores/${v}/teardown`)
      .set('Cookie', operator)
      .send({ kept: [{ kind: 'cylinder_head' }] });
    expect(res.status).toBe(400);
    expect((await request(t.app).post(`/api/cores/${v}/teardown`).set('Cookie', operator).send(v8Parts)).status).toBe(
      201,
    );
    res = await request(t.app).post(`/api/cores/${v}/teardown`).set('Cookie', operator).send(v8Parts);
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/already been torn down/);
  });

  it('a serial with a wrong character is caught with the reason', async () => {
    const serial = await receivedCore();
    const last = serial.slice(-1);
    const wrong = serial.slice(0, -1) + (last === 'A' ? 'B' : 'A');
    const res = await request(t.app).get(`/api/items/${wrong}`).set('Cookie', operator);
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/check character does not match/);
  });
});

describe('labels', () => {
  it('the PNG QR decodes (with jsQR, an independent decoder) back to the serial; the SVG is an SVG', async () => {
    const res = await request(t.app).post('/api/cores').set('Cookie', receiving).send(customerReturn());
    const serial = res.body.serial as string;
    const png = await request(t.app).get(`/api/items/${serial}/label.png`).set('Cookie', receiving).buffer(true);
    expect(png.headers['content-type']).toBe('image/png');
    const image = PNG.sync.read(png.body as Buffer);
    const decoded = jsQR(new Uint8ClampedArray(image.data), image.width, image.height);
    expect(decoded?.data).toBe(serial);
    const svg = await request(t.app).get(`/api/items/${serial}/label.svg`).set('Cookie', receiving);
    expect(svg.headers['content-type']).toMatch(/image\/svg\+xml/);
    expect((svg.body as Buffer).toString('utf8')).toMatch(/^<svg/);
  });

  it('logs a first print and then a reprint', async () => {
    const res = await request(t.app).post('/api/cores').set('Cookie', receiving).send(customerReturn());
    const serial = res.body.serial as string;
    const first = await request(t.app)
      .post('/api/labels/printed')
      .set('Cookie', receiving)
      .send({ serials: [serial], stock: '2x1in' });
    expect(first.body.printed).toEqual([{ serial, reprint: false }]);
    // a reprint says why; without a reason nothing is logged
    const unexplained = await request(t.app)
      .post('/api/labels/printed')
      .set('Cookie', receiving)
      .send({ serials: [serial], stock: '50x25mm' });
    expect(unexplained.status).toBe(400);
    expect(unexplained.body.error.fields.reprintReason).toMatch(/printed again/);
    const second = await request(t.app)
      .post('/api/labels/printed')
      .set('Cookie', receiving)
      .send({ serials: [serial], stock: '50x25mm', reprintReason: 'Tag lost in the parts washer' });
    expect(second.body.printed).toEqual([{ serial, reprint: true }]);
    const item = await Item.findOne({ where: { serial } });
    expect((await LabelPrint.findOne({ where: { itemId: item!.id, reprint: true } }))!.reprintReason).toBe(
      'Tag lost in the parts washer',
    );
    expect(await LabelPrint.count({ where: { itemId: item!.id } })).toBe(2);
    expect(await AuditEvent.count({ where: { entityId: serial, action: 'label.reprinted' } })).toBe(1);
    expect(
      (
        await request(t.app)
          .post('/api/labels/printed')
          .set('Cookie', warranty)
          .send({ serials: [serial], stock: '2x1in' })
      ).status,
    ).toBe(403);
  });
});
