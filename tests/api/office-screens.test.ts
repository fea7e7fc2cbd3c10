import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CoreReceipt, Customer, EngineFamily, MailOutbox } from '../../server/models/index.js';
import { cookieFor, makeTestApp, makeUser, unique, type TestApp } from '../support/app.js';

/** Things the office screens got wrong, each seen once by hand. */

let t: TestApp;
let receiving: string;
let admin: string;
let v8: EngineFamily;
let six: EngineFamily;
let customerId: number;

beforeAll(async () => {
  t = makeTestApp();
  receiving = await cookieFor(await makeUser('receiving'), t.config);
  admin = await cookieFor(await makeUser('admin'), t.config);
  v8 = (await EngineFamily.findOne({ where: { code: 'CORRIE-8' } }))!;
  six = (await EngineFamily.findOne({ where: { code: 'TARN-6' } }))!;
  customerId = (await Customer.findOne())!.id;
});
afterAll(() => t.close());

const core = (over: Record<string, unknown> = {}) => ({
  familyId: v8.id,
  castingNumber: `CX ${unique('').slice(0, 6).toUpperCase()}`,
  source: 'customer_return',
  customerId,
  sourceReference: unique('RMA-'),
  receivedOn: new Date().toISOString().slice(0, 10),
  complete: true,
  grade: 'sound',
  accepted: true,
  creditDecision: 'full',
  ...over,
});
const receive = (body: object) => request(t.app).post('/api/cores').set('Cookie', receiving).send(body);

describe('intake cross-checks', () => {
  it('when a cracked core is graded sound with full credit, then it is not logged without a reason; with one, the reason is kept', async () => {
    const body = core({ damage: ['cracked'] });
    const refused = await receive(body);
    expect(refused.status).toBe(409);
    expect(refused.body.error.reason).toBe('needs_reason');
    expect(refused.body.error.mismatches).toEqual([
      'The core is recorded as cracked, but graded sound (every major part expected to be reused).',
      'Full core credit for a core recorded as cracked.',
    ]);
    expect(await CoreReceipt.count({ where: { sourceReference: body.sourceReference } })).toBe(0);

    const ok = await receive({ ...body, mismatchReason: 'Crack is in the oil pan rail, a separate casting' });
    expect(ok.status).toBe(201);
    const receipt = (await CoreReceipt.findOne({ where: { sourceReference: body.sourceReference } }))!;
    expect(receipt.condition).toMatchObject({
      damage: ['cracked'],
      mismatchReason: 'Crack is in the oil pan rail, a separate casting',
    });
  });

  it('when a V8 core is logged with a casting number only ever received on sixes, then it asks for a reason', async () => {
    const casting = `TN ${unique('').slice(0, 6).toUpperCase()}`;
    expect((await receive(core({ familyId: six.id, castingNumber: casting }))).status).toBe(201);
    // another core with the same number is not a duplicate here: the look-alike question is answered
    const wrong = await receive(core({ castingNumber: casting, confirmNotDuplicate: true }));
    expect(wrong.status).toBe(409);
    expect(wrong.body.error.mismatches).toEqual([
      `Casting number ${casting} has been received before only as TARN-6 (1 core), not CORRIE-8.`,
    ]);
    // the same family again is no question
    expect((await receive(core({ familyId: six.id, castingNumber: casting, confirmNotDuplicate: true }))).status).toBe(
      201,
    );
  });

  it('when major parts are missing and the credit is full, then it asks for a reason', async () => {
    const res = await receive(core({ complete: false, missing: ['crankshaft'] }));
    expect(res.status).toBe(409);
    expect(res.body.error.mismatches).toEqual(['Full core credit though crankshaft is missing.']);
  });
});

describe('the mail page', () => {
  it('when an admin opens a queued message, then its body is shown as it was written', async () => {
    const m = await MailOutbox.create({
      toAddress: 'someone@test.example',
      subject: `Test message ${unique()}`,
      bodyText: 'First line\n\n    quoted line\n— Coretrail',
      bodyHtml: null,
      claimedBy: null,
      claimedUntil: null,
      lastError: null,
      sentAt: null,
      messageId: null,
      reason: 'ncr.raised',
    });
    const res = await request(t.app).get(`/api/mail/outbox/${m.id}`).set('Cookie', admin);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ to: 'someone@test.example', text: 'First line\n\n    quoted line\n— Coretrail' });
    expect((await request(t.app).get('/api/mail/outbox/999999999').set('Cookie', admin)).status).toBe(404);
    expect((await request(t.app).get(`/api/mail/outbox/${m.id}`).set('Cookie', receiving)).status).toBe(403);
  });
});
