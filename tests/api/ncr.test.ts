import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { Op } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nominalSizeClasses, passingReadings } from '../../db/seeders/sample-readings.js';
import { readMailSink, startMailSink } from '../../server/mail/sink.js';
import { MailWorker } from '../../server/mail/worker.js';
import { AuditEvent, Item, MailOutbox, Nonconformance, Signature } from '../../server/models/index.js';
import { TEST_PASSWORD, cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';
import { formFor, gaugesOf, pass, passThrough, tornDownCore } from '../support/parts.js';

let t: TestApp;
let receiving: string;
let operator: string;
let quality: string;
let quality2: string;
let supervisor: string;
let operatorEmail: string;

beforeAll(async () => {
  t = makeTestApp();
  receiving = await cookieFor(await makeUser('receiving'), t.config);
  const op = await makeUser('operator', { name: 'Floor Operator' });
  operatorEmail = op.email;
  operator = await cookieFor(op, t.config);
  quality = await cookieFor(await makeUser('quality', { name: 'First Quality' }), t.config);
  quality2 = await cookieFor(await makeUser('quality', { name: 'Second Quality' }), t.config);
  supervisor = await cookieFor(await makeUser('supervisor'), t.config);
});
afterAll(() => t.close());

/** A V8 block that failed bore and hone on one reading: its NCR number and serial. */
async function failedBlock(value = 4.0309) {
  const parts = await tornDownCore(t, { receiving, operator }, 'CORRIE-8');
  await passThrough(t, operator, ['CLN-1', 'MPI-1', 'PT-1', 'LH-1'], parts.block);
  const form = await formFor(t, operator, 'BH-1', parts.block);
  const res = await request(t.app)
    .post('/api/results')
    .set('Cookie', operator)
    .send({
      idempotencyKey: randomUUID(),
      serial: parts.block,
      station: 'BH-1',
      ...gaugesOf(form),
      readings: passingReadings(form, (c, p, v) => (c === 'bore' && p === 'c2/top/axial' ? value : v)),
      sizeClasses: nominalSizeClasses(form),
    });
  expect(res.body.verdict).toBe('fail');
  return { serial: parts.block, number: res.body.nonconformance.number as string, resultId: res.body.id as number };
}

const post = (cookie: string, url: string, body: object = {}) =>
  request(t.app).post(url).set('Cookie', cookie).send(body);
const get = (cookie: string, url: string) => request(t.app).get(url).set('Cookie', cookie);

describe('an NCR from a failing result', () => {
  it('is raised with the failing characteristic, holds the part and queues mail to quality in the same transaction', async () => {
    const { serial, number } = await failedBlock();
    const ncr = await get(quality, `/api/ncrs/${number}`);
    expect(ncr.status).toBe(200);
    expect(ncr.body).toMatchObject({
      state: 'raised',
      severity: 'major',
      serial,
      stageCode: 'bore-hone',
      defectCode: 'OOT',
    });
    expect(ncr.body.failing[0]).toMatchObject({ characteristic: 'bore', position: 'c2/top/axial', value: 4.0309 });
    expect(ncr.body.allowed).toEqual(['review', 'void']);
    expect(ncr.body.item.status).toBe('on_hold');
    const mails = await MailOutbox.findAll({
      where: { reason: 'ncr.raised', subject: `NCR ${number} raised on ${serial}` },
    });
    expect(mails.length).toBeGreaterThanOrEqual(2);
    expect(mails[0]!.bodyText).toContain(`/ncrs/${number}`);
  });

  it('rework: reviewed, signed, reworked at the station, passes, and the NCR closes by itself', async () => {
    const { serial, number } = await failedBlock();
    expect((await post(quality, `/api/ncrs/${number}/review`, { note: 'Looking at the bore map' })).body.state).toBe(
      'in_review',
    );
    const decided = await post(quality, `/api/ncrs/${number}/disposition`, {
      disposition: 'rework',
      reason: 'Re-hone cylinder 2 to size',
      reworkStage: 'bore-hone',
      password: TEST_PASSWORD,
    });
    expect(decided.status).toBe(200);
    expect(decided.body).toMatchObject({ state: 'decided', disposition: 'rework', reworkStage: { code: 'bore-hone' } });
    expect(decided.body.signatures).toEqual([
      expect.objectContaining({ printedName: 'First Quality', meaning: `Rework on ${number}` }),
    ]);
    expect(decided.body.item.status).toBe('in_process');
    // closing by hand before the rework passed is refused
    const early = await post(quality, `/api/ncrs/${number}/close`);
    expect(early.status).toBe(409);
    expect(early.body.error.reason).toBe('rework_not_passed');

    // the station says why the part is back
    const due = await formFor(t, operator, 'BH-1', serial);
    expect(due.rework).toEqual({ number, disposition: 'rework', reason: 'Re-hone cylinder 2 to size' });
    const reworked = await pass(t, operator, 'BH-1', serial);
    expect(reworked.item.currentStage.code).toBe('block-deck');
    const closed = await get(quality, `/api/ncrs/${number}`);
    expect(closed.body.state).toBe('closed');
    const steps = closed.body.timeline.filter((e: { kind: string }) => e.kind === 'step');
    expect(steps.map((e: { to: string }) => e.to)).toEqual(['raised', 'in_review', 'decided', 'closed']);
    // in words, never a row number: the stage where the rework passed
    expect(steps[3].reason).toBe('Rework passed at Bore and hone');
    expect(steps[3].reason).not.toContain(String(reworked.id));
    // the signature sits in the timeline under its own signer and reason
    expect(closed.body.timeline).toContainEqual(
      expect.objectContaining({ kind: 'signature', actor: 'First Quality', reason: 'Re-hone cylinder 2 to size' }),
    );
    const told = await MailOutbox.findOne({
      where: { reason: 'ncr.decided', toAddress: operatorEmail, subject: `NCR ${number} on ${serial}: Rework` },
    });
    expect(told).not.toBeNull();
  });

  it('a rework that fails again raises a new NCR and closes the first one pointing at it', async () => {
    const { serial, number } = await failedBlock();
    await post(quality, `/api/ncrs/${number}/review`);
    await post(quality, `/api/ncrs/${number}/disposition`, {
      disposition: 'rework',
      reason: 'Re-hone',
      reworkStage: 'bore-hone',
      password: TEST_PASSWORD,
    });
    const form = await formFor(t, operator, 'BH-1', serial);
    expect(form.sequence.ok).toBe(true);
    const again = await post(operator, '/api/results', {
      idempotencyKey: randomUUID(),
      serial,
      station: 'BH-1',
      ...gaugesOf(form),
      readings: passingReadings(form, (c, p, v) => (c === 'bore' && p === 'c2/top/axial' ? 4.0312 : v)),
      sizeClasses: nominalSizeClasses(form),
    });
    expect(again.body.verdict).toBe('fail');
    const first = await get(quality, `/api/ncrs/${number}`);
    expect(first.body.state).toBe('closed');
    expect(first.body.timeline.at(-1).reason).toBe(
      `Rework failed again at Bore and hone; carried on as ${again.body.nonconformance.number}`,
    );
    expect((await Item.findOne({ where: { serial } }))!.status).toBe('on_hold');
  });

  it('scrap ends the part for good; stations refuse it', async () => {
    const { serial, number } = await failedBlock(4.05);
    await post(quality, `/api/ncrs/${number}/review`);
    const scrapped = await post(quality, `/api/ncrs/${number}/disposition`, {
      disposition: 'scrap',
      reason: 'Bored past the last oversize',
      password: TEST_PASSWORD,
    });
    expect(scrapped.body).toMatchObject({ state: 'closed', disposition: 'scrap' });
    expect(scrapped.body.item.status).toBe('scrapped');
    const form = await formFor(t, operator, 'BH-1', serial);
    expect(form.sequence).toMatchObject({ ok: false, code: 'scrapped' });
  });
});

describe('refusals change nothing', () => {
  it('invalid transitions are 409 with the possible next steps', async () => {
    const { number } = await failedBlock();
    const close = await post(quality, `/api/ncrs/${number}/close`);
    expect(close.status).toBe(409);
    expect(close.body.error).toMatchObject({
      reason: 'invalid_transition',
      state: 'raised',
      allowed: ['review', 'void'],
    });
    const decide = await post(quality, `/api/ncrs/${number}/disposition`, {
      disposition: 'use_as_is',
      reason: 'Fine as it is',
      password: TEST_PASSWORD,
    });
    expect(decide.status).toBe(409);
    expect(decide.body.error.message).toMatch(
      /is raised: you cannot decide it now\. What you can do: start the review, void it\./,
    );
    const counter = await post(quality2, `/api/ncrs/${number}/countersign`, {
      reason: 'Agree',
      password: TEST_PASSWORD,
    });
    expect(counter.status).toBe(409);
    // a role without the right
    expect((await post(operator, `/api/ncrs/${number}/review`)).status).toBe(403);
    expect((await post(supervisor, `/api/ncrs/${number}/void`, { reason: 'Not a real fault' })).status).toBe(403);
    // a failure recorded by a station is a fact: it is dispositioned, not voided
    const voided = await post(quality, `/api/ncrs/${number}/void`, { reason: 'Raised in error' });
    expect(voided.status).toBe(409);
    expect(voided.body.error.reason).toBe('raised_by_result');
    const ncr = (await Nonconformance.findOne({ where: { number } }))!;
    expect(ncr.state).toBe('raised');
    expect(await AuditEvent.count({ where: { entity: 'nonconformance', entityId: number } })).toBe(1);
  });

  it('a use-as-is without the signature, or with a wrong password, is refused and signs nothing', async () => {
    const { number } = await failedBlock();
    await post(quality, `/api/ncrs/${number}/review`);
    const unsigned = await post(quality, `/api/ncrs/${number}/disposition`, {
      disposition: 'use_as_is',
      reason: 'Within the repair manual',
    });
    expect(unsigned.status).toBe(400);
    expect(unsigned.body.error.fields.password).toBe('Enter your password to sign.');
    const wrong = await post(quality, `/api/ncrs/${number}/disposition`, {
      disposition: 'use_as_is',
      reason: 'Within the repair manual',
      password: 'guess',
    });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.code).toBe('signature_refused');
    expect(await Signature.count({ where: { entity: 'nonconformance', entityId: number } })).toBe(0);
    expect((await Nonconformance.findOne({ where: { number } }))!.disposition).toBeNull();
    const missingStage = await post(quality, `/api/ncrs/${number}/disposition`, {
      disposition: 'rework',
      reason: 'Re-hone',
      password: TEST_PASSWORD,
    });
    expect(missingStage.body.error.fields.reworkStage).toBe('Choose the stage the part goes back to.');
  });

  it('a critical use-as-is needs a second quality signer who is not the first', async () => {
    const parts = await tornDownCore(t, { receiving, operator }, 'TARN-6');
    await pass(t, operator, 'CLN-1', parts.block);
    const crack = await post(operator, '/api/results', {
      idempotencyKey: randomUUID(),
      serial: parts.block,
      station: 'MPI-1',
      readings: [
        { characteristic: 'crack-free', passed: false, location: 'Casting flash at the rear face, not a crack' },
      ],
    });
    const number = crack.body.nonconformance.number as string;
    expect(crack.body.nonconformance.severity).toBe('critical');
    await post(quality, `/api/ncrs/${number}/review`);
    const first = await post(quality, `/api/ncrs/${number}/disposition`, {
      disposition: 'use_as_is',
      reason: 'Indication is casting flash, dressed off',
      password: TEST_PASSWORD,
    });
    expect(first.body).toMatchObject({ state: 'in_review', awaitingSecondSignature: true, disposition: 'use_as_is' });
    expect(first.body.item.status).toBe('on_hold');
    const same = await post(quality, `/api/ncrs/${number}/countersign`, { reason: 'Agree', password: TEST_PASSWORD });
    expect(same.status).toBe(409);
    expect(same.body.error.reason).toBe('same_signer');
    const second = await post(quality2, `/api/ncrs/${number}/countersign`, {
      reason: 'Seen it: flash',
      password: TEST_PASSWORD,
    });
    expect(second.status).toBe(200);
    expect(second.body.state).toBe('closed');
    expect(second.body.signatures.map((s: { printedName: string }) => s.printedName)).toEqual([
      'First Quality',
      'Second Quality',
    ]);
    // accepted as it is: the block carries on past the crack test
    expect(second.body.item).toMatchObject({ status: 'in_process', currentStage: { code: 'block-pressure' } });
  });
});

describe('a concern raised by hand', () => {
  it('holds the part at once; the station names the NCR; voiding it puts the part back', async () => {
    const parts = await tornDownCore(t, { receiving, operator }, 'CORRIE-8');
    const raised = await post(operator, '/api/ncrs', {
      serial: parts.crankshaft,
      description: '=HYPERLINK("x") Nick on the rear main journal seen while washing',
      severity: 'minor',
      defectCode: 'DMG',
    });
    expect(raised.status).toBe(201);
    expect(raised.body.item.status).toBe('on_hold');
    const form = await formFor(t, operator, 'CLN-2', parts.crankshaft);
    expect(form.sequence).toMatchObject({ ok: false, code: 'on_hold' });
    expect(form.sequence.message).toContain(raised.body.number);
    const voided = await post(quality, `/api/ncrs/${raised.body.number}/void`, {
      reason: 'Only a mark in the oil film',
    });
    expect(voided.body.state).toBe('voided');
    expect(voided.body.item.status).toBe('in_process');
    expect((await formFor(t, operator, 'CLN-2', parts.crankshaft)).sequence.ok).toBe(true);

    const csv = await get(quality, `/api/ncrs/export.csv?q=${encodeURIComponent('rear main journal')}`);
    expect(csv.headers['content-type']).toMatch(/text\/csv/);
    expect(csv.text).toContain(`'=HYPERLINK`);
    expect(csv.text.split('\r\n')[0]).toMatch(/^\ufeffNCR,State,Severity,Serial/);
  });

  it('is refused field by field when incomplete', async () => {
    const res = await post(operator, '/api/ncrs', { serial: 'BK-7KX4-P2MK', description: 'bad', severity: 'awful' });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['defectCode', 'description', 'severity']);
  });
});

describe('the NCR list', () => {
  it('filters by state, severity, defect code, family, stage and age on the server, and pages', async () => {
    const { number } = await failedBlock();
    const open = await get(quality, '/api/ncrs?state=open&severity=major&defect=OOT&stage=bore-hone&pageSize=200');
    expect(open.status).toBe(200);
    expect(open.body.rows.map((r: { number: string }) => r.number)).toContain(number);
    expect(
      open.body.rows.every(
        (r: { state: string; severity: string; stageCode: string }) =>
          ['raised', 'in_review', 'decided'].includes(r.state) && r.severity === 'major' && r.stageCode === 'bore-hone',
      ),
    ).toBe(true);
    const old = await get(quality, '/api/ncrs?olderThanDays=1');
    expect(old.body.rows.map((r: { number: string }) => r.number)).not.toContain(number);
    const paged = await get(quality, '/api/ncrs?pageSize=1&page=2&sort=number&dir=asc');
    expect(paged.body.rows).toHaveLength(1);
    expect(paged.body.total).toBeGreaterThan(1);
    const bad = await get(quality, '/api/ncrs?severity=awful&olderThanDays=-1');
    expect(bad.status).toBe(400);
  });
});

describe('mail delivery', () => {
  it('delivers queued messages to the loopback sink exactly once, even when a worker dies after claiming them', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'coretrail-sink-'));
    const sink = await startMailSink({ port: 0, dir });
    try {
      const { number, serial } = await failedBlock();
      const queued = await MailOutbox.findAll({ where: { subject: `NCR ${number} raised on ${serial}` } });
      expect(queued.length).toBeGreaterThan(0);
      expect(queued.every((m) => m.status === 'pending')).toBe(true);
      // the workers here deliver only this test's messages: the other suites share the outbox
      const onlyIds = queued.map((m) => String(m.id));
      // a worker claims the rows and dies before sending any of them
      const doomed = new MailWorker(t.sequelize, {
        smtp: { host: '127.0.0.1', port: sink.port },
        from: 'x@t.example',
        leaseSeconds: 1,
        batch: queued.length,
        onlyIds,
      });
      const claimed = await doomed.claim();
      expect(claimed.length).toBe(queued.length);
      expect(readMailSink(dir)).toHaveLength(0);
      await new Promise((r) => setTimeout(r, 1200));
      // two workers, as two API processes would run, take over the expired lease together
      const opts = { smtp: { host: '127.0.0.1', port: sink.port }, from: 'Coretrail <c@t.example>', onlyIds };
      const a = new MailWorker(t.sequelize, opts);
      const b = new MailWorker(t.sequelize, opts);
      await Promise.all([a.drain(), b.drain()]);
      await Promise.all([a.stop(), b.stop(), doomed.stop()]);

      const got = readMailSink(dir).filter((m) => m.subject === `NCR ${number} raised on ${serial}`);
      expect(got).toHaveLength(queued.length);
      expect(new Set(got.map((m) => m.messageId)).size).toBe(queued.length);
      expect(got[0]!.text).toContain(`/ncrs/${number}`);
      for (const m of queued) {
        await m.reload();
        expect(m.status).toBe('sent');
      }
    } finally {
      await sink.close();
    }
  });

  it('keeps typed text out of the headers', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'coretrail-sink-'));
    const sink = await startMailSink({ port: 0, dir });
    try {
      const parts = await tornDownCore(t, { receiving, operator }, 'TARN-6');
      const raised = await post(operator, '/api/ncrs', {
        serial: parts.block,
        description: 'Dent on the pan rail\r\nBcc: someone@elsewhere.example\r\nSubject: hijacked',
        severity: 'critical',
        defectCode: 'DMG',
      });
      expect(raised.status).toBe(201);
      const mine = await MailOutbox.findAll({ where: { subject: { [Op.like]: `%NCR ${raised.body.number} %` } } });
      const w = new MailWorker(t.sequelize, {
        smtp: { host: '127.0.0.1', port: sink.port },
        from: 'Coretrail <c@t.example>',
        onlyIds: mine.map((m) => String(m.id)),
      });
      await w.drain();
      await w.stop();
      const got = readMailSink(dir).filter((m) => m.subject.includes(raised.body.number));
      expect(got.length).toBeGreaterThan(0);
      for (const m of got) {
        expect(m.subject).toBe(`Critical NCR ${raised.body.number} raised on ${parts.block}`);
        expect(m.to).not.toContain('someone@elsewhere.example');
        expect(m.headers).not.toHaveProperty('bcc');
        expect(m.text).toContain('    Bcc: someone@elsewhere.example');
      }
      // critical: quality and supervisors are told
      const roles = await MailOutbox.findAll({ where: { subject: got[0]!.subject } });
      expect(roles.length).toBe(got.length);
    } finally {
      await sink.close();
    }
  });
});

describe('purchased lots and the plant’s defect codes', () => {
  it('a concern about a lot holds it out of builds; returning it to the supplier closes the NCR', async () => {
    const { PartLot, Supplier } = await import('../../server/models/index.js');
    const supplier = (await Supplier.findOne({ order: [['id', 'DESC']] }))!;
    const lotCode = `RB-${randomUUID().slice(0, 6).toUpperCase()}`;
    const lot = await PartLot.create({
      supplierId: supplier.id,
      partKind: 'rod_bearings',
      partNumber: 'RB-2210',
      lotCode,
    });
    const raised = await post(operator, '/api/ncrs', {
      lotCode,
      description: 'Shells in this box show scoring straight out of the wrapper',
      severity: 'major',
      defectCode: 'LOT',
    });
    expect(raised.status).toBe(201);
    expect(raised.body).toMatchObject({
      serial: null,
      item: null,
      lotCode,
      lot: { lotCode, partNumber: 'RB-2210', status: 'usable' },
    });
    const neither = await post(operator, '/api/ncrs', {
      description: 'Something is wrong here',
      severity: 'minor',
      defectCode: 'LOT',
    });
    expect(neither.body.error.fields.serial).toMatch(/or give a lot code/);

    await post(quality, `/api/ncrs/${raised.body.number}/review`);
    const rework = await post(quality, `/api/ncrs/${raised.body.number}/disposition`, {
      disposition: 'rework',
      reason: 'Polish them',
      reworkStage: 'bore-hone',
      password: TEST_PASSWORD,
    });
    expect(rework.status).toBe(400);
    expect(rework.body.error.message).toMatch(/no route/);
    const returned = await post(quality, `/api/ncrs/${raised.body.number}/disposition`, {
      disposition: 'return_to_supplier',
      reason: 'Scored shells: supplier credit requested',
      password: TEST_PASSWORD,
    });
    expect(returned.body).toMatchObject({
      state: 'closed',
      disposition: 'return_to_supplier',
      lot: { status: 'returned' },
    });
    await lot.reload();
    expect(lot.status).toBe('returned');
  });

  it('quality keeps the defect code list: add, reword, retire; a retired code cannot be used', async () => {
    const code = `T${randomUUID().slice(0, 5).toUpperCase()}`;
    const added = await post(quality, '/api/defect-codes', { code, description: 'Thread damage in a bolt hole' });
    expect(added.status).toBe(201);
    expect((await post(quality, '/api/defect-codes', { code, description: 'Again' })).status).toBe(409);
    expect((await post(operator, '/api/defect-codes', { code: 'XX', description: 'Nope' })).status).toBe(403);
    const retired = await request(t.app)
      .patch(`/api/defect-codes/${code}`)
      .set('Cookie', quality)
      .send({ active: false });
    expect(retired.body).toEqual({ code, description: 'Thread damage in a bolt hole', active: false });
    const list = await get(operator, '/api/defect-codes');
    expect(list.body).toContainEqual({ code, description: 'Thread damage in a bolt hole', active: false });
    const parts = await tornDownCore(t, { receiving, operator }, 'TARN-6');
    const refused = await post(operator, '/api/ncrs', {
      serial: parts.block,
      description: 'Stripped head bolt hole at the rear',
      severity: 'major',
      defectCode: code,
    });
    expect(refused.status).toBe(400);
    expect(refused.body.error.fields.defectCode).toBe(`No defect code ${code}.`);
  });
});

describe('two NCRs on one part', () => {
  it('voiding a concern while a rework is decided lets the part through its rework stage', async () => {
    const { serial, number } = await failedBlock();
    await post(quality, `/api/ncrs/${number}/review`);
    const concern = await post(operator, '/api/ncrs', {
      serial,
      description: 'Chipped pan rail corner noticed at the hone',
      severity: 'minor',
      defectCode: 'DMG',
    });
    await post(quality, `/api/ncrs/${number}/disposition`, {
      disposition: 'rework',
      reason: 'Re-hone cylinder 2',
      reworkStage: 'bore-hone',
      password: TEST_PASSWORD,
    });
    // the concern still holds it
    expect((await formFor(t, operator, 'BH-1', serial)).sequence).toMatchObject({ ok: false, code: 'on_hold' });
    await post(quality, `/api/ncrs/${concern.body.number}/void`, {
      reason: 'Old damage, already on the intake photos',
    });
    const form = await formFor(t, operator, 'BH-1', serial);
    expect(form.sequence.ok).toBe(true);
    await pass(t, operator, 'BH-1', serial);
    expect((await Nonconformance.findOne({ where: { number } }))!.state).toBe('closed');
  });
});

describe('rework goes back, never forward', () => {
  it('refuses a rework stage after the one where the problem was found', async () => {
    const { number, serial } = await failedBlock();
    await post(quality, `/api/ncrs/${number}/review`);
    const forward = await post(quality, `/api/ncrs/${number}/disposition`, {
      disposition: 'rework',
      reason: 'Skip ahead',
      reworkStage: 'block-deck',
      password: TEST_PASSWORD,
    });
    expect(forward.status).toBe(400);
    expect(forward.body.error.fields.reworkStage).toBe('Bore and hone or earlier.');
    const back = await post(quality, `/api/ncrs/${number}/disposition`, {
      disposition: 'rework',
      reason: 'Re-bore from line hone',
      reworkStage: 'line-hone',
      password: TEST_PASSWORD,
    });
    expect(back.body.item).toMatchObject({ status: 'in_process', currentStage: { code: 'line-hone' } });
    // found by its serial however it is typed
    const found = await get(quality, `/api/ncrs?state=open&q=${serial.replace(/-/g, '').toLowerCase()}`);
    expect(found.body.rows.map((r: { number: string }) => r.number)).toContain(number);
  });
});
