import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { Op, QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nominalSizeClasses, passingReadings } from '../../db/seeders/sample-readings.js';
import {
  AuditEvent,
  Containment,
  Customer,
  FieldAction,
  Gauge,
  Item,
  MailOutbox,
  Signature,
} from '../../server/models/index.js';
import { blastRadius } from '../../server/services/blast-radius/index.js';
import { gaugeState } from '../../server/services/gauge-suitability.js';
import { todayIn } from '../../shared/domain/warranty.js';
import type { StationFormJson } from '../../shared/schemas/results.js';
import { TEST_PASSWORD, cookieFor, makeTestApp, makeUser, unique, type TestApp } from '../support/app.js';
import {
  CRANK_STATIONS,
  HEAD_STATIONS,
  formFor,
  gaugesOf,
  lotsFor,
  passThrough,
  plantToday,
  tornDownCore,
} from '../support/parts.js';

/** The gauge register, calibrations, suitability at the station, and the blast radius of a bad gauge. */

let t: TestApp;
let cookies: { receiving: string; operator: string };
let quality: string;
let shipping: string;
let customer: Customer;

beforeAll(async () => {
  t = makeTestApp();
  cookies = {
    receiving: await cookieFor(await makeUser('receiving'), t.config),
    operator: await cookieFor(await makeUser('operator'), t.config),
  };
  quality = await cookieFor(await makeUser('quality', { name: 'Gauge Quality', quickSignature: true }), t.config);
  shipping = await cookieFor(await makeUser('shipping', { quickSignature: true }), t.config);
  customer = (await Customer.findOne({ where: { email: { [Op.ne]: null } }, order: [['id', 'DESC']] }))!;
});
afterAll(() => t.close());

const post = (cookie: string, url: string, body: object = {}) =>
  request(t.app).post(url).set('Cookie', cookie).send(body);
const get = (cookie: string, url: string, query: object = {}) =>
  request(t.app).get(url).query(query).set('Cookie', cookie);
// codes of this file's own gauges sort after the demo's, so other files' helpers never pick them
const code = () => `ZT-${randomUUID().slice(0, 6).toUpperCase()}`;

async function registerGauge(over: Partial<Record<string, unknown>> = {}) {
  const c = code();
  const res = await post(quality, '/api/gauges', {
    code: c,
    description: 'Test bore gauge 3–6 in',
    kind: 'bore gauge',
    serial: unique('SN'),
    unit: 'in',
    resolution: 0.0001,
    rangeLow: 3,
    rangeHigh: 6,
    location: 'Test cell',
    owner: 'Quality',
    intervalDays: 180,
    ...over,
  });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return c;
}

const calibrate = (c: string, asFound: number, extra: object = {}) =>
  post(quality, `/api/gauges/${c}/calibrations`, {
    calibratedOn: plantToday(),
    performedBy: 'in_house',
    performer: 'Test bench',
    points: [
      { reference: 3.5, asFound, asLeft: 3.5, tolerance: 0.0001 },
      { reference: 5.5, asFound: 5.5, asLeft: 5.5, tolerance: 0.0001 },
    ],
    ...extra,
  });

async function blockAtBoreHone(family = 'TARN-6') {
  const parts = await tornDownCore(t, cookies, family);
  await passThrough(t, cookies.operator, ['CLN-1', 'MPI-1', 'PT-1', 'LH-1'], parts.block);
  return parts;
}

/** The bore-and-hone result a tablet would send, with `gauge` as the result's gauge (it reads the bores). */
function boreBody(serial: string, form: StationFormJson, gauge: string) {
  const { gauges } = gaugesOf(form);
  return {
    idempotencyKey: randomUUID(),
    serial,
    station: 'BH-1',
    gauge,
    gauges,
    readings: passingReadings(form),
    sizeClasses: nominalSizeClasses(form),
  };
}

describe('suitability at entry', () => {
  it('when the gauge reads in a unit that does not convert to the characteristic’s, then the reading is refused', async () => {
    const { block } = await blockAtBoreHone();
    const form = await formFor(t, cookies.operator, 'BH-1', block);
    // PG-011 reads psi; a bore is in inches (NIST SP 811 has no psi → in factor: not the same quantity)
    const res = await post(cookies.operator, '/api/results', boreBody(block, form, 'PG-011'));
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('gauge_unsuitable');
    expect(res.body.error.fields.gauge).toMatch(/reads in psi, which cannot be converted to in/);
    expect(form.gauges.find((g) => g.code === 'PG-011')!.unfit.bore).toMatch(/cannot be converted/);
    expect((await Item.findOne({ where: { serial: block } }))!.currentStageId).not.toBeNull();
  });

  it('when the limits fall outside the gauge’s range, then the reading is refused', async () => {
    const { block } = await blockAtBoreHone();
    const form = await formFor(t, cookies.operator, 'BH-1', block);
    // OM-022 is a 2–3 in micrometer; the TARN-6 bore is 3.7205 ± 0.0005 in (demo spec book)
    const res = await post(cookies.operator, '/api/results', boreBody(block, form, 'OM-022'));
    expect(res.status).toBe(400);
    expect(res.body.error.fields.gauge).toMatch(/fall outside the range of OM-022 \(2–3 in\)/);
  });

  it('when the gauge is coarser than a tenth of the tolerance band, then it is refused until quality relaxes the ratio with a reason', async () => {
    const coarse = await registerGauge({ resolution: 0.001, description: 'Coarse bore gauge' });
    expect((await calibrate(coarse, 3.5)).status).toBe(201);
    const { block } = await blockAtBoreHone();
    const form = await formFor(t, cookies.operator, 'BH-1', block);
    // band 0.001 in (± 0.0005); 0.001 > 0.001 / 10 (the ten-to-one rule: common practice)
    const refused = await post(cookies.operator, '/api/results', boreBody(block, form, coarse));
    expect(refused.status).toBe(400);
    expect(refused.body.error.fields.gauge).toMatch(/coarser than 1\/10 of the 0.001 in tolerance band/);

    const bore = form.characteristics.find((c) => c.code === 'bore')!;
    const [boreRow] = await t.sequelize.query<{ id: number }>(
      "SELECT c.id FROM characteristics c JOIN stages s ON s.id = c.stage_id WHERE c.code = 'bore' AND s.code = 'bore-hone'",
      { type: QueryTypes.SELECT },
    );
    const boreId = boreRow!.id;
    expect(bore).toBeTruthy();
    const noReason = await post(quality, `/api/gauge-ratios/${boreId}`, { ratio: 1 });
    expect(noReason.status).toBe(400);
    const relaxed = await post(quality, `/api/gauge-ratios/${boreId}`, {
      ratio: 1,
      reason: 'Test: accept one to one for this drill',
    });
    try {
      expect(relaxed.status).toBe(200);
      const ok = await post(cookies.operator, '/api/results', boreBody(block, form, coarse));
      expect(ok.status, JSON.stringify(ok.body)).toBe(201);
      const event = await AuditEvent.findOne({
        where: { action: 'characteristic.gauge_ratio_set', entityId: String(boreId) },
        order: [['id', 'DESC']],
      });
      expect(event!.after).toMatchObject({ gaugeRatio: 1, reason: 'Test: accept one to one for this drill' });
    } finally {
      await post(quality, `/api/gauge-ratios/${boreId}`, {
        ratio: null,
        reason: 'Test over: back to 10',
      });
    }
  });

  it('when a gauge has no calibration on record, then the station lists it as unusable and refuses it', async () => {
    const fresh = await registerGauge();
    const { block } = await blockAtBoreHone();
    const form = await formFor(t, cookies.operator, 'BH-1', block);
    expect(form.gauges.find((g) => g.code === fresh)).toMatchObject({
      usable: false,
      why: expect.stringMatching(/No calibration on record/),
    });
    const res = await post(cookies.operator, '/api/results', boreBody(block, form, fresh));
    expect(res.status).toBe(400);
    expect(res.body.error.fields.gauge).toMatch(/No calibration on record/);
    // once calibrated in tolerance, the same gauge is offered and takes the reading
    expect((await calibrate(fresh, 3.5)).status).toBe(201);
    const again = await post(
      cookies.operator,
      '/api/results',
      boreBody(block, await formFor(t, cookies.operator, 'BH-1', block), fresh),
    );
    expect(again.status, JSON.stringify(again.body)).toBe(201);
  });

  it('when the server’s UTC date has moved on but the plant’s has not, then a gauge due today is still usable', () => {
    const g = Gauge.build({
      code: 'X-1',
      description: 'x',
      kind: 'x',
      resolution: 0.0001,
      unit: 'in',
      rangeLow: 3,
      rangeHigh: 6,
      intervalDays: 30,
      calibrationDueOn: '2026-03-01',
      calibrated: true,
      status: 'in_use',
    });
    // 03:00 UTC on 2 March is 21:00 on 1 March in Chicago (UTC−6 in winter; IANA tz database)
    const at = new Date('2026-03-02T03:00:00Z');
    expect(todayIn('America/Chicago', at)).toBe('2026-03-01');
    expect(gaugeState(g, todayIn('America/Chicago', at))).toMatchObject({ usable: true, state: 'due' });
    expect(gaugeState(g, at.toISOString().slice(0, 10))).toMatchObject({ usable: false, state: 'overdue' });
  });
});

describe('the gauge register and calibrations', () => {
  it('when a calibration is recorded, then as found and as left are kept, the due date follows the interval, and an audit event says so', async () => {
    const c = await registerGauge({ intervalDays: 90 });
    const future = await calibrate(c, 3.5, { calibratedOn: '2099-01-01' });
    expect(future.status).toBe(400);
    const lab = await calibrate(c, 3.5, { performedBy: 'lab', performer: 'Test Lab' });
    expect(lab.status).toBe(400);
    expect(lab.body.error.fields.certificate).toMatch(/certificate number/);
    const ok = await calibrate(c, 3.50005);
    expect(ok.status).toBe(201);
    expect(ok.body).toMatchObject({
      asFoundInTolerance: true,
      asLeftInTolerance: true,
      result: 'adjusted',
      asFoundError: 0.00005,
    });
    const list = await get(quality, '/api/gauges');
    const row = list.body.rows.find((r: { code: string }) => r.code === c);
    expect(row).toMatchObject({ calibrated: true, state: 'in_use', daysLeft: 90, lastCalibratedOn: plantToday() });
    const events = await AuditEvent.count({ where: { entity: 'gauge', entityId: c, action: 'gauge.calibrated' } });
    expect(events).toBe(1);
  });

  it('when a certificate that is not a PDF is uploaded, then it is refused by its bytes', async () => {
    const res = await request(t.app)
      .post('/api/gauges/certificates')
      .set('Cookie', quality)
      .attach('file', Buffer.from('%not a pdf at all'), 'certificate.pdf');
    expect(res.status).toBe(415);
    expect(res.body.error.code).toBe('not_a_pdf');
  });
});

/** Passes a part through stations; at BH-1 the bores are read with `boreGauge`. */
async function passWith(cookie: string, stations: string[], serial: string, boreGauge: string | null) {
  for (const s of stations) {
    const form = await formFor(t, cookie, s, serial);
    const g = gaugesOf(form);
    const res = await post(cookie, '/api/results', {
      idempotencyKey: randomUUID(),
      serial,
      station: s,
      ...g,
      ...(s === 'BH-1' && boreGauge ? { gauge: boreGauge } : {}),
      readings: passingReadings(form),
      sizeClasses: nominalSizeClasses(form),
    });
    if (res.status !== 201 || res.body.verdict !== 'pass') throw new Error(`${s}: ${JSON.stringify(res.body)}`);
  }
}

describe('the blast radius of a gauge found out of tolerance', () => {
  it('when a bore gauge is found out of tolerance as found, then the blast radius matches a hand-written query, one signed step holds what is in the plant, and the customer is told', async () => {
    const g = await registerGauge();
    expect((await calibrate(g, 3.5)).status).toBe(201);
    const tag = `B${randomUUID().slice(0, 5).toUpperCase()}`;

    // one block bored with the gauge goes into a unit that ships; another stays in the plant
    const shippedParts = await tornDownCore(t, cookies, 'TARN-6');
    await passWith(
      cookies.operator,
      ['CLN-1', 'MPI-1', 'PT-1', 'LH-1', 'BH-1', 'DK-1', 'WSH-1'],
      shippedParts.block,
      g,
    );
    await passThrough(t, cookies.operator, CRANK_STATIONS, shippedParts.crankshaft);
    for (const h of shippedParts.heads) await passThrough(t, cookies.operator, HEAD_STATIONS, h);
    const built = await post(cookies.operator, '/api/units', {
      family: 'TARN-6',
      block: shippedParts.block,
      crankshaft: shippedParts.crankshaft,
      heads: shippedParts.heads,
      lots: await lotsFor(0.0197, tag),
    });
    expect(built.status, JSON.stringify(built.body)).toBe(201);
    const unit = built.body.serial as string;
    await passThrough(t, cookies.operator, ['AS-1', 'RT-1', 'FI-1'], unit);
    const shipped = await post(shipping, `/api/units/${unit}/release`, {
      customerId: customer.id,
      reference: `SO-${unit}`,
      shipDate: plantToday(),
      password: TEST_PASSWORD,
    });
    expect(shipped.status, JSON.stringify(shipped.body)).toBe(201);
    const inPlant = await tornDownCore(t, cookies, 'TARN-6');
    await passWith(cookies.operator, ['CLN-1', 'MPI-1', 'PT-1', 'LH-1', 'BH-1'], inPlant.block, g);

    // found 0.0004 in high at 3.5 in (permitted 0.0001): out of tolerance as found, adjusted
    const found = await calibrate(g, 3.5004);
    expect(found.status).toBe(201);
    expect(found.body).toMatchObject({ asFoundInTolerance: false, result: 'out_of_tolerance', asFoundError: 0.0004 });

    const blast = await get(quality, '/api/blast-radius', { gauge: g });
    expect(blast.status, JSON.stringify(blast.body)).toBe(200);

    // the same question, written by hand: every reading with the gauge, its part, the unit it is in,
    // and that unit's live shipment; a pass within 0.0004 in of a limit could change
    const expected = await t.sequelize.query<{
      serial: string;
      readings: number;
      doubtful: number;
      unit: string | null;
      customer: string | null;
    }>(
      `SELECT part.serial, count(*)::int AS readings,
              sum(CASE WHEN r.verdict = 'pass' AND (abs(r.value - (tr.nominal - tr.minus_tol)) <= 0.0004
                                                   OR abs(r.value - (tr.nominal + tr.plus_tol)) <= 0.0004)
                       THEN 1 ELSE 0 END)::int AS doubtful,
              (SELECT u.serial FROM item_links l JOIN items u ON u.id = l.parent_item_id
                WHERE l.child_item_id = part.id AND l.link_type = 'installed_in' AND l.removed_at IS NULL) AS unit,
              (SELECT cu.name FROM item_links l JOIN shipments s ON s.unit_item_id = l.parent_item_id
                 JOIN customers cu ON cu.id = s.customer_id
                WHERE l.child_item_id = part.id AND l.link_type = 'installed_in' AND l.removed_at IS NULL
                  AND s.returned_at IS NULL) AS customer
         FROM readings r
         JOIN gauges gg ON gg.id = r.gauge_id
         JOIN stage_results sr ON sr.id = r.stage_result_id
         JOIN items part ON part.id = sr.item_id
         JOIN tolerance_rules tr ON tr.id = r.tolerance_rule_id
        WHERE gg.code = :g
        GROUP BY part.id, part.serial ORDER BY part.serial`,
      { type: QueryTypes.SELECT, replacements: { g } },
    );
    expect(expected.map((e) => e.serial)).toEqual([shippedParts.block, inPlant.block].sort());
    const got = [...blast.body.parts]
      .sort((a: { serial: string }, b: { serial: string }) => a.serial.localeCompare(b.serial))
      .map(
        (p: {
          serial: string;
          readings: number;
          couldChange: number;
          unit: string | null;
          customer: string | null;
        }) => ({
          serial: p.serial,
          readings: p.readings,
          doubtful: p.couldChange,
          unit: p.unit,
          customer: p.customer,
        }),
      );
    expect(got).toEqual(expected);
    expect(blast.body.totals).toMatchObject({
      readings: expected.reduce((s, e) => s + e.readings, 0),
      parts: 2,
      units: 1,
      shipped: 1,
      inPlant: 1,
      customers: 1,
    });
    expect(blast.body.customers).toEqual([
      {
        name: customer.name,
        email: customer.email,
        units: [{ serial: unit, shipDate: plantToday(), order: `SO-${unit}` }],
      },
    ]);
    expect(blast.body.guardBand).toEqual({ error: 0.0004, unit: 'in' });

    // the screen names the most doubtful parts only; the counts and customers are still of all of them
    const first = await blastRadius(t.sequelize, { gauge: g }, 200, 1);
    expect(first.parts).toHaveLength(1);
    expect(first.parts[0]!.serial).toBe(blast.body.parts[0].serial);
    expect(first.totals).toEqual(blast.body.totals);
    expect(first.customers).toEqual(blast.body.customers);

    // the station no longer offers the gauge
    const next = await blockAtBoreHone();
    const form = await formFor(t, cookies.operator, 'BH-1', next.block);
    expect(form.gauges.find((x) => x.code === g)).toMatchObject({
      usable: false,
      why: expect.stringMatching(/out of tolerance/),
    });

    // exports: every reading in the CSV; the PDF is a PDF
    const csv = await get(quality, '/api/blast-radius/export', { gauge: g, format: 'csv' });
    expect(csv.status).toBe(200);
    expect(csv.text.trim().split('\n')).toHaveLength(1 + blast.body.totals.readings);
    const pdf = await get(quality, '/api/blast-radius/export', { gauge: g, format: 'pdf' }).buffer(true);
    expect(pdf.status).toBe(200);
    expect(Buffer.from(pdf.body).subarray(0, 5).toString()).toBe('%PDF-');

    // a wrong password holds nothing
    const body = {
      trigger: { gauge: g },
      reason: 'Bore gauge found 0.0004 in high',
      defectCode: 'OOT',
      fieldActions: true,
    };
    const wrong = await post(quality, '/api/containments', { ...body, password: 'not the password' });
    expect(wrong.status).toBe(400);
    expect((await Item.findOne({ where: { serial: inPlant.block } }))!.status).not.toBe('on_hold');

    const contained = await post(quality, '/api/containments', { ...body, password: TEST_PASSWORD });
    expect(contained.status, JSON.stringify(contained.body)).toBe(201);
    const number = contained.body.number as string;
    expect(contained.body.held).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ serial: inPlant.block, outcome: 'held' }),
        expect.objectContaining({ serial: shippedParts.block, outcome: 'field_action' }),
      ]),
    );
    expect((await Item.findOne({ where: { serial: inPlant.block } }))!.status).toBe('on_hold');
    const fa = await FieldAction.findAll({ where: { number: contained.body.fieldActions } });
    expect(fa).toHaveLength(1);
    const sig = await Signature.findOne({ where: { entity: 'containment', entityId: number } });
    expect(sig).toMatchObject({ printedName: 'Gauge Quality', reason: body.reason });
    expect(await AuditEvent.count({ where: { action: 'containment.opened', entityId: number } })).toBe(1);
    expect(await Containment.count({ where: { number } })).toBe(1);

    // the held block cannot be recorded at its next station
    const held = await get(cookies.operator, `/api/stations/DK-1/form`, { serial: inPlant.block });
    expect(held.body.sequence).toMatchObject({ ok: false, code: 'on_hold' });

    // the customer notice goes through the outbox
    const notice = await post(quality, `/api/containments/${number}/notice`, {
      message: 'A gauge used on the cylinder bores of this engine was found reading high. Please hold it uninstalled.',
    });
    expect(notice.status, JSON.stringify(notice.body)).toBe(200);
    const mail = await MailOutbox.findOne({
      where: { toAddress: customer.email!, subject: { [Op.like]: 'Notice about%' } },
      order: [['id', 'DESC']],
    });
    expect(mail!.bodyText).toContain(unit);
    expect(mail!.bodyText).toContain(number);
  });
});
