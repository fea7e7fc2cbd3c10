import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { Op } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, Customer, FieldAction, MailOutbox, Shipment, Signature } from '../../server/models/index.js';
import { TEST_PASSWORD, cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';
import { finishedParts, passThrough, plantToday, releasableUnit } from '../support/parts.js';
import { claimPeople, returnedClaim } from '../support/warranty.js';

/** What happens when a problem is found after assembly, or after shipping; and the release's signature. */

let t: TestApp;
let cookies: { receiving: string; operator: string };
let shipping: string;
let quality: string;
let warrantyEmail: string;
let warranty: string;
let customer: Customer;

beforeAll(async () => {
  t = makeTestApp();
  cookies = {
    receiving: await cookieFor(await makeUser('receiving'), t.config),
    operator: await cookieFor(await makeUser('operator'), t.config),
  };
  shipping = await cookieFor(await makeUser('shipping', { name: 'Late Shipper' }), t.config);
  quality = await cookieFor(await makeUser('quality', { name: 'Late Quality' }), t.config);
  const desk = await makeUser('warranty', { name: 'Late Desk' });
  warrantyEmail = desk.email;
  warranty = await cookieFor(desk, t.config);
  customer = (await Customer.findOne({ where: { email: { [Op.ne]: null } }, order: [['id', 'ASC']] }))!;
});
afterAll(() => t.close());

const post = (cookie: string, url: string, body: object = {}) =>
  request(t.app).post(url).set('Cookie', cookie).send(body);
const get = (cookie: string, url: string) => request(t.app).get(url).set('Cookie', cookie);
const tag = () => `L${randomUUID().slice(0, 6).toUpperCase()}`;
const release = (unit: string, extra: object = {}) =>
  post(shipping, `/api/units/${unit}/release`, {
    customerId: customer.id,
    reference: `SO-${unit}`,
    shipDate: plantToday(),
    password: TEST_PASSWORD,
    ...extra,
  });

describe('release is a signed act', () => {
  it('when the shipper signs with a wrong password, then nothing ships; with theirs, the signature says what it means', async () => {
    const { unit } = await releasableUnit(t, cookies, 'TARN-6', tag());
    const wrong = await release(unit, { password: 'not the password' });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error).toMatchObject({ code: 'signature_refused', fields: { password: expect.any(String) } });
    expect(await Shipment.count({ where: { reference: `SO-${unit}` } })).toBe(0);
    expect(await Signature.count({ where: { entity: 'item', entityId: unit } })).toBe(0);

    const ok = await release(unit);
    expect(ok.status).toBe(201);
    const sig = await Signature.findOne({ where: { entity: 'item', entityId: unit } });
    expect(sig).toMatchObject({ printedName: 'Late Shipper', meaning: 'Released for shipment' });
    expect(sig!.reason).toContain(`SO-${unit}`);
  });

  it('when the ship date is after today in the plant’s calendar, then it is refused', async () => {
    const { unit } = await releasableUnit(t, cookies, 'TARN-6', tag());
    const tomorrow = new Date(Date.parse(`${plantToday()}T12:00:00Z`) + 86_400_000).toISOString().slice(0, 10);
    const res = await release(unit, { shipDate: tomorrow });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.shipDate).toBe(`Not after ${plantToday()}.`);
  });
});

describe('a part scrapped after assembly', () => {
  it('when a head is scrapped in a built unit, then a new head is fitted, the unit is tested again and released, and the trail keeps both', async () => {
    const { unit, parts } = await releasableUnit(t, cookies, 'TARN-6', tag());
    const cracked = parts.heads[0]!;
    const raised = await post(cookies.operator, '/api/ncrs', {
      serial: cracked,
      description: 'Crack from the exhaust seat into the port',
      severity: 'critical',
      defectCode: 'CRK',
    });
    await post(quality, `/api/ncrs/${raised.body.number}/review`);
    await post(quality, `/api/ncrs/${raised.body.number}/disposition`, {
      disposition: 'scrap',
      reason: 'Cracked through the seat',
      password: TEST_PASSWORD,
    });
    expect((await get(shipping, `/api/units/${unit}/release-check`)).body.releasable).toBe(false);

    // a part of another kind is refused, and nothing changes
    const spare = await finishedParts(t, cookies, 'TARN-6');
    const wrongKind = await post(cookies.operator, `/api/units/${unit}/replace`, {
      remove: cracked,
      fit: spare.block,
      reason: 'Cracked head replaced',
    });
    expect(wrongKind.status).toBe(409);
    expect(wrongKind.body.error).toMatchObject({ code: 'replace_refused' });
    expect(wrongKind.body.error.fields.fit).toMatch(/is a block, not a cylinder head/);
    expect((await get(cookies.operator, `/api/items/${cracked}`)).body.status).toBe('scrapped');

    const replaced = await post(cookies.operator, `/api/units/${unit}/replace`, {
      remove: cracked,
      fit: spare.heads[0],
      reason: 'Cracked head replaced',
    });
    expect(replaced.status, JSON.stringify(replaced.body)).toBe(200);
    expect(replaced.body).toMatchObject({ status: 'in_process', currentStage: { code: 'long-block-assembly' } });
    // the old assembly and run test were with the cracked head: they no longer count
    const waiting = await get(shipping, `/api/units/${unit}/release-check`);
    expect(waiting.body.releasable).toBe(false);
    expect(waiting.body.reasons.map((r: { message: string }) => r.message)).toContain(
      `${unit}: Long block assembly has no result yet.`,
    );
    await passThrough(t, cookies.operator, ['AS-1', 'RT-1', 'FI-1'], unit);
    const ok = await release(unit);
    expect(ok.status, JSON.stringify(ok.body)).toBe(201);

    const trail = await get(warranty, `/api/trail/${unit}`);
    const heads = trail.body.tree.children.filter((c: { kind: string }) => c.kind === 'cylinder_head');
    expect(heads).toEqual([
      expect.objectContaining({
        serial: cracked,
        status: 'scrapped',
        fittedAt: expect.any(String),
        removedAt: expect.any(String),
        removedReason: 'Cracked head replaced',
      }),
      expect.objectContaining({ serial: spare.heads[0], status: 'installed', removedAt: null }),
    ]);
    expect(Date.parse(heads[1].fittedAt)).toBeGreaterThanOrEqual(Date.parse(heads[0].removedAt));
  });
});

describe('a part replaced in a unit back under a claim', () => {
  it('when a head is replaced in a returned unit, then the unit goes back to its first stage and the head taken out is a finished part again', async () => {
    const { unit, parts } = await releasableUnit(t, cookies, 'TARN-6', tag());
    expect((await release(unit)).status).toBe(201);
    await returnedClaim(t, await claimPeople(t), unit);
    expect((await get(cookies.operator, `/api/items/${unit}`)).body.status).toBe('returned');

    const spare = await finishedParts(t, cookies, 'TARN-6');
    const replaced = await post(cookies.operator, `/api/units/${unit}/replace`, {
      remove: parts.heads[0],
      fit: spare.heads[0],
      reason: 'Head replaced under the claim',
    });
    expect(replaced.status, JSON.stringify(replaced.body)).toBe(200);
    expect(replaced.body).toMatchObject({ status: 'in_process', currentStage: { code: 'long-block-assembly' } });
    expect((await get(cookies.operator, `/api/items/${parts.heads[0]}`)).body.status).toBe('finished');
    expect((await get(cookies.operator, `/api/items/${spare.heads[0]}`)).body.status).toBe('installed');
    const event = await AuditEvent.findOne({ where: { action: 'unit.part_replaced', entityId: unit } });
    expect(event).toMatchObject({
      before: { status: 'returned', currentStage: null },
      after: { status: 'in_process', removed: parts.heads[0], fitted: spare.heads[0] },
    });
  });
});

describe('a problem found after the unit shipped', () => {
  it('when an NCR is raised on a part of a shipped unit, then a field action opens, the desk is mailed, and quality closes it with a signature', async () => {
    const { unit, parts } = await releasableUnit(t, cookies, 'TARN-6', tag());
    expect((await release(unit)).status).toBe(201);
    const raised = await post(cookies.operator, '/api/ncrs', {
      serial: parts.crankshaft,
      description: 'Same grinder batch found with a soft journal on another crank',
      severity: 'major',
      defectCode: 'OOT',
    });
    expect(raised.status).toBe(201);
    const listed = await get(warranty, '/api/field-actions?state=open');
    const mine = listed.body.rows.find((r: { ncr: { number: string } }) => r.ncr.number === raised.body.number);
    expect(mine).toMatchObject({
      state: 'open',
      unit: { serial: unit },
      shipment: { reference: `SO-${unit}`, customer: customer.name },
      ncr: { number: raised.body.number, subject: parts.crankshaft },
    });
    expect(await FieldAction.count({ where: { number: mine.number, state: 'open' } })).toBe(1);
    const mailed = await MailOutbox.findOne({
      where: { reason: 'field_action.opened', toAddress: warrantyEmail, subject: { [Op.like]: `%${mine.number}%` } },
    });
    expect(mailed).not.toBeNull();
    // the trail shows it
    const trail = await get(warranty, `/api/trail/${unit}`);
    expect(trail.body.fieldActions.map((a: { number: string }) => a.number)).toContain(mine.number);
    // the desk follows it, quality decides it
    const desk = await post(warranty, `/api/field-actions/${mine.number}/decide`, {
      decision: 'no_action',
      reason: 'Not for us',
      password: TEST_PASSWORD,
    });
    expect(desk.status).toBe(403);
    const wrong = await post(quality, `/api/field-actions/${mine.number}/decide`, {
      decision: 'notify_customer',
      reason: 'Ask them to check journal 3',
      password: 'nope',
    });
    expect(wrong.status).toBe(400);
    const decided = await post(quality, `/api/field-actions/${mine.number}/decide`, {
      decision: 'notify_customer',
      reason: 'Ask them to check journal 3 at the first service',
      password: TEST_PASSWORD,
    });
    expect(decided.status).toBe(200);
    expect(decided.body).toMatchObject({
      state: 'closed',
      decision: 'notify_customer',
      decidedBy: 'Late Quality',
      signature: { printedName: 'Late Quality', reason: 'Ask them to check journal 3 at the first service' },
    });
    const notice = await MailOutbox.findOne({
      where: {
        reason: 'field_action.notify_customer',
        toAddress: customer.email!,
        subject: { [Op.like]: `%${unit}%` },
      },
    });
    expect(notice).not.toBeNull();
    const again = await post(quality, `/api/field-actions/${mine.number}/decide`, {
      decision: 'recall',
      reason: 'Changed my mind',
      password: TEST_PASSWORD,
    });
    expect(again.status).toBe(409);
  });

  it('when a lot NCR reaches units still in the plant and shipped ones, then only the shipped ones get field actions', async () => {
    const lots = tag();
    const shipped = await releasableUnit(t, cookies, 'TARN-6', lots);
    const inPlant = await releasableUnit(t, cookies, 'TARN-6', lots);
    expect((await release(shipped.unit)).status).toBe(201);
    const raised = await post(cookies.operator, '/api/ncrs', {
      lotCode: `${lots}-MAINBEARINGS`,
      description: 'Bearing shells from this lot measured under size',
      severity: 'major',
      defectCode: 'LOT',
    });
    expect(raised.status).toBe(201);
    const listed = await get(quality, '/api/field-actions?state=open&pageSize=200');
    const forNcr = listed.body.rows.filter((r: { ncr: { number: string } }) => r.ncr.number === raised.body.number);
    expect(forNcr.map((r: { unit: { serial: string } }) => r.unit.serial)).toEqual([shipped.unit]);
    // the one still in the plant is held by the open NCR instead
    const check = await get(shipping, `/api/units/${inPlant.unit}/release-check`);
    expect(check.body.reasons.map((r: { code: string }) => r.code)).toContain('lot_ncr_open');
  });
});
