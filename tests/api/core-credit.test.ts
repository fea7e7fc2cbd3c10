import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  AuditEvent,
  CoreCreditRevision,
  CoreReceipt,
  Customer,
  EngineFamily,
  Item,
  Supplier,
} from '../../server/models/index.js';
import { cookieFor, makeTestApp, makeUser, unique, type TestApp } from '../support/app.js';
import { pngImage } from '../support/images.js';
import { tornDownCore } from '../support/parts.js';

/** A core's credit settled after teardown: a new record beside the dock's decision, both in the intake log. */

let t: TestApp;
let receiving: string;
let operator: string;
let supervisor: string;

beforeAll(async () => {
  t = makeTestApp();
  receiving = await cookieFor(await makeUser('receiving', { name: 'Credit Receiver' }), t.config);
  operator = await cookieFor(await makeUser('operator'), t.config);
  supervisor = await cookieFor(await makeUser('supervisor', { name: 'Credit Supervisor' }), t.config);
});
afterAll(() => t.close());

const revise = (cookie: string, serial: string, body: object) =>
  request(t.app).post(`/api/cores/${serial}/credit-revisions`).set('Cookie', cookie).send(body);
const revisionsOf = async (serial: string) =>
  CoreCreditRevision.count({ where: { coreItemId: (await Item.findOne({ where: { serial } }))!.id } });

async function receivedCore(source: 'customer_return' | 'purchased') {
  const family = (await EngineFamily.findOne({ where: { code: 'TARN-6' } }))!;
  const res = await request(t.app)
    .post('/api/cores')
    .set('Cookie', receiving)
    .send({
      familyId: family.id,
      castingNumber: `CX ${unique('').slice(0, 6).toUpperCase()}`,
      idNumber: unique('ID').toUpperCase(),
      source,
      ...(source === 'customer_return'
        ? { customerId: (await Customer.findOne())!.id, creditDecision: 'full' }
        : { supplierId: (await Supplier.findOne())!.id }),
      sourceReference: unique('REF-'),
      receivedOn: new Date().toISOString().slice(0, 10),
      complete: true,
      grade: 'sound',
      accepted: true,
    });
  return res.body.serial as string;
}

describe('core credit settled after teardown', () => {
  it('when a torn-down core’s credit is revised, then the dock’s decision is kept, the revision recorded and audited, and the intake log and its CSV show both', async () => {
    const { core } = await tornDownCore(t, { receiving, operator }, 'TARN-6');
    const photo = await request(t.app)
      .post('/api/attachments')
      .set('Cookie', receiving)
      .attach('file', pngImage(), 'crack.png');
    const res = await revise(receiving, core, {
      creditDecision: 'partial',
      reason: 'Block cracked between cylinders 3 and 4 at teardown',
      photoIds: [photo.body.id],
    });
    expect(res.status).toBe(201);
    expect(res.body).toHaveLength(1);
    expect(res.body[0]).toMatchObject({ creditDecision: 'partial', revisedBy: 'Credit Receiver' });
    expect(res.body[0].photos).toHaveLength(1);
    const receipt = (await CoreReceipt.findOne({
      where: { itemId: (await Item.findOne({ where: { serial: core } }))!.id },
    }))!;
    expect(receipt.creditDecision).toBe('full');
    const [event] = await AuditEvent.findAll({
      where: { entity: 'item', entityId: core, action: 'core.credit_revised' },
    });
    expect(event!.before).toEqual({ creditDecision: 'full', atDock: 'full' });
    expect(event!.after).toMatchObject({ creditDecision: 'partial' });

    // a second revision is another record; the newest is the credit as settled
    const again = await revise(supervisor, core, {
      creditDecision: 'none',
      reason: 'Crank also past its last undersize',
    });
    expect(again.status).toBe(201);
    expect(again.body.map((r: { creditDecision: string }) => r.creditDecision)).toEqual(['partial', 'none']);

    const log = await request(t.app).get(`/api/cores?q=${core}`).set('Cookie', receiving);
    expect(log.body.rows[0]).toMatchObject({
      serial: core,
      creditDecision: 'full',
      settledCredit: 'none',
      settledReason: 'Crank also past its last undersize',
      settledBy: 'Credit Supervisor',
    });
    const csv = await request(t.app).get(`/api/cores/export.csv?q=${core}`).set('Cookie', receiving);
    const [head, row] = csv.text.trim().split('\r\n');
    const cells = Object.fromEntries(head!.split(',').map((h, i) => [h, row!.split(',')[i]]));
    expect(cells).toMatchObject({
      core_credit: 'full',
      core_credit_settled: 'none',
      settled_reason: 'Crank also past its last undersize',
      settled_by: 'Credit Supervisor',
    });
  });

  it('when the core is not torn down, was bought, or the credit is unchanged, then it is refused and nothing is written', async () => {
    const waiting = await receivedCore('customer_return');
    const early = await revise(receiving, waiting, { creditDecision: 'partial', reason: 'Looks cracked' });
    expect(early.status).toBe(409);
    expect(early.body.error.reason).toBe('not_torn_down');
    const bought = await receivedCore('purchased');
    expect((await revise(receiving, bought, { creditDecision: 'none', reason: 'Bought core' })).status).toBe(409);
    const { core } = await tornDownCore(t, { receiving, operator }, 'TARN-6');
    const same = await revise(receiving, core, { creditDecision: 'full', reason: 'Confirmed sound' });
    expect(same.status).toBe(400);
    expect(same.body.error.fields.creditDecision).toBe('That is the credit as it stands.');
    for (const body of [
      { creditDecision: 'half', reason: 'Half of it' },
      { creditDecision: 'none', reason: 'x' },
      { creditDecision: 'none', reason: 'Cracked block', revisedBy: 'someone else' },
      { creditDecision: 'none', reason: 'Cracked block', photoIds: [99_999_999] },
    ]) {
      expect((await revise(receiving, core, body)).status, JSON.stringify(body)).toBe(400);
    }
    expect((await revise(operator, core, { creditDecision: 'none', reason: 'Cracked block' })).status).toBe(403);
    for (const serial of [waiting, bought, core]) expect(await revisionsOf(serial)).toBe(0);
  });
});
