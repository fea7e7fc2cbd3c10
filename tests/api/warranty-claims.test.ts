import { Op } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  AuditEvent,
  Item,
  ItemLink,
  MailOutbox,
  Shipment,
  Signature,
  WarrantyClaim,
  WarrantyFinding,
} from '../../server/models/index.js';
import type { ClaimJson } from '../../shared/schemas/warranty.js';
import { TEST_PASSWORD, makeTestApp, type TestApp } from '../support/app.js';
import type { UnitCopy } from '../support/clone-units.js';
import { plantToday } from '../support/parts.js';
import {
  claimBody,
  claimPeople,
  get,
  mailedCustomer,
  post,
  returnedClaim,
  shippedOn,
  shippedUnits,
  type ClaimPeople,
} from '../support/warranty.js';

/**
 * Warranty claims through the API: coverage at each limit, every signed step with its signature
 * and audit event, the returned unit's teardown against the parts as they were built, and bad
 * input answered 4xx with nothing written.
 */

let t: TestApp;
let people: ClaimPeople;
let units: UnitCopy[];
let customerId: number;
const next = () => units.shift()!;

beforeAll(async () => {
  t = makeTestApp();
  people = await claimPeople(t);
  units = await shippedUnits(t, people, 18);
  customerId = (await mailedCustomer()).id;
}, 240_000);
afterAll(() => t.close());

const coverage = (unit: string, failedOn: string, km?: number) =>
  get(
    t,
    people.desk.cookie,
    `/api/warranty/coverage?serial=${unit}&failedOn=${failedOn}${km === undefined ? '' : `&km=${km}`}`,
  );
const signaturesOf = (number: string) =>
  Signature.findAll({ where: { entity: 'warranty_claim', entityId: number }, order: [['id', 'ASC']] });
const eventsOf = (number: string) =>
  AuditEvent.findAll({ where: { entity: 'warranty_claim', entityId: number }, order: [['id', 'ASC']] });
const claimsOn = async (unit: string) =>
  WarrantyClaim.count({ where: { unitItemId: (await Item.findOne({ where: { serial: unit } }))!.id } });

describe('coverage at each limit (TARN-6: 24 months and 100,000 km, whichever comes first)', () => {
  // Hand-worked on a printed calendar: shipped 2024-02-29 (a leap day), 24 months on is
  // 2026-02-29, which does not exist, so the term ends on 2026-02-28, and that day is covered.
  it('when a unit shipped on a leap day fails on the last day, then it is covered; the day after, not', async () => {
    const unit = next().unit;
    await shippedOn(t, unit, '2024-02-29');
    const last = await coverage(unit, '2026-02-28', 100_000);
    expect(last.status).toBe(200);
    expect(last.body).toMatchObject({ covered: true, endsOn: '2026-02-28', months: 24, km: 100_000 });
    expect(last.body.reason).toBe('Covered until 2026-02-28; 100,000 km is within the 100,000 km limit.');
    // 2024-02-29 → 2026-02-28: 366 + 365 − 1 days (2024-03-01 → 2025-02-28 spans 2025's non-leap February)
    expect(last.body.daysInService).toBe(730);
    const after = await coverage(unit, '2026-03-01', 50_000);
    expect(after.body).toMatchObject({ covered: false });
    expect(after.body.reason).toBe('Not covered: the 24-month term ended on 2026-02-28.');
  });

  it('when the distance is one kilometre past the limit inside the term, then it is not covered, and both reasons are said together', async () => {
    const unit = next().unit;
    await shippedOn(t, unit, '2025-08-31');
    const over = await coverage(unit, '2026-01-10', 100_001);
    expect(over.body.covered).toBe(false);
    expect(over.body.reason).toBe('Not covered: 100,001 km is past the 100,000 km limit.');
    await shippedOn(t, unit, '2024-08-31');
    // 2024-08-31 + 24 months = 2026-08-31 (August has 31 days): 2026-09-01 is past it
    const both = await coverage(unit, '2026-09-01', 150_000);
    expect(both.body.reason).toBe(
      'Not covered: the 24-month term ended on 2026-08-31; 150,000 km is past the 100,000 km limit.',
    );
    const noKm = await coverage(unit, '2026-08-31');
    expect(noKm.body.reason).toBe('Covered until 2026-08-31 and up to 100,000 km, whichever comes first.');
  });

  it('when the failure date is before the ship date or after today, then 400 on failedOn', async () => {
    const unit = next().unit;
    await shippedOn(t, unit, '2025-05-10');
    const before = await coverage(unit, '2025-05-09');
    expect(before.status).toBe(400);
    expect(before.body.error.fields.failedOn).toBe('Not before 2025-05-10, its ship date.');
    const tomorrow = new Date(Date.parse(`${plantToday()}T12:00:00Z`) + 86_400_000).toISOString().slice(0, 10);
    const future = await coverage(unit, tomorrow);
    expect(future.status).toBe(400);
    expect(future.body.error.fields.failedOn).toBe(`Not after ${plantToday()}.`);
    expect((await get(t, people.desk.cookie, `/api/warranty/coverage?serial=${unit}&failedOn=yesterday`)).status).toBe(
      400,
    );
  });

  it('when the claim is logged, then the coverage is kept on it as it was said', async () => {
    const unit = next().unit;
    await shippedOn(t, unit, '2024-02-29');
    const res = await post(
      t,
      people.desk.cookie,
      '/api/warranty/claims',
      claimBody(unit, customerId, { failedOn: '2026-03-01', distanceKm: 61_250 }),
    );
    expect(res.status).toBe(201);
    expect(res.body.coverage).toEqual({
      covered: false,
      reason: 'Not covered: the 24-month term ended on 2026-02-28.',
      endsOn: '2026-02-28',
    });
  });
});

describe('logging a claim', () => {
  it('when the desk logs a claim, then it is received, signed, audited and mailed to receiving', async () => {
    const unit = next().unit;
    const res = await post(
      t,
      people.desk.cookie,
      '/api/warranty/claims',
      claimBody(unit, customerId, { hours: 812.5 }),
    );
    expect(res.status).toBe(201);
    const claim = res.body as ClaimJson;
    expect(claim).toMatchObject({ state: 'received', next: 'return', covered: true, hours: 812.5, distanceKm: 42_000 });
    expect(claim.number).toMatch(/^WC-\d{4}-\d{5,}$/);
    const [sig] = await signaturesOf(claim.number);
    expect(sig).toMatchObject({
      printedName: 'Claim Desk',
      meaning: `Logged warranty claim ${claim.number} on ${unit}`,
    });
    expect(sig!.reason).toContain('Knocks under load');
    const events = await eventsOf(claim.number);
    expect(events.map((e) => e.action)).toEqual(['warranty_claim.received']);
    expect(events[0]!.after).toMatchObject({ unit, covered: true, signedBy: 'Claim Desk' });
    const mail = await MailOutbox.findAll({ where: { subject: `Claim ${claim.number}: ${unit} is coming back` } });
    expect(mail.map((m) => m.toAddress)).toContain(people.receiving.user.email);
  });

  it('when the input is bad, then 400 names the field and nothing is written', async () => {
    const unit = next().unit;
    const cases: [Record<string, unknown>, string][] = [
      [{ distanceKm: null, hours: null }, 'distanceKm'],
      [{ distanceKm: -3 }, 'distanceKm'],
      [{ distanceKm: 12.5 }, 'distanceKm'],
      [{ symptom: 'bad' }, 'symptom'],
      [{ installer: '' }, 'installer'],
      [{ failedOn: '2026-02-30' }, 'failedOn'],
      [{ customerId: 99_999_999 }, 'customerId'],
      [{ warrantyMonths: 99 }, 'warrantyMonths'],
      [{ password: 'not my password' }, 'password'],
    ];
    for (const [change, field] of cases) {
      const res = await post(t, people.desk.cookie, '/api/warranty/claims', claimBody(unit, customerId, change));
      expect(res.status, JSON.stringify(change)).toBe(400);
      expect(Object.keys(res.body.error.fields), JSON.stringify(change)).toContain(field);
    }
    expect(await claimsOn(unit)).toBe(0);
    expect(
      await Signature.count({
        where: { entity: 'warranty_claim', printedName: 'Claim Desk', reason: { [Op.like]: `%${unit}%` } },
      }),
    ).toBe(0);
  });

  it('when the serial is a part, not shipped, or the unit has a claim open, then it is refused', async () => {
    const unit = next();
    const part = await post(
      t,
      people.desk.cookie,
      '/api/warranty/claims',
      claimBody(unit.parts[0]!.serial, customerId),
    );
    expect(part.status).toBe(400);
    expect(part.body.error.fields.serial).toBe('Use the long block’s serial.');
    const first = await post(t, people.desk.cookie, '/api/warranty/claims', claimBody(unit.unit, customerId));
    expect(first.status).toBe(201);
    const second = await post(t, people.desk.cookie, '/api/warranty/claims', claimBody(unit.unit, customerId));
    expect(second.status).toBe(409);
    expect(second.body.error).toMatchObject({ reason: 'claim_open', claim: first.body.number });
    expect(await claimsOn(unit.unit)).toBe(1);
  });

  it('when another role logs a claim, then 403 and nothing is written', async () => {
    const unit = next().unit;
    const res = await post(t, people.receiving.cookie, '/api/warranty/claims', claimBody(unit, customerId));
    expect(res.status).toBe(403);
    expect(await claimsOn(unit)).toBe(0);
  });
});

describe('the returned unit', () => {
  it('when receiving takes the unit back, then the shipment ends, the unit is no longer shipped and the gate says why it cannot ship', async () => {
    const unit = next().unit;
    const logged = await post(t, people.desk.cookie, '/api/warranty/claims', claimBody(unit, customerId));
    const number = logged.body.number as string;
    const early = await post(t, people.operator.cookie, `/api/warranty/claims/${number}/teardown`, {
      findings: [{ part: unit, causeCode: 'NTF', description: 'Ran clean on the stand' }],
      password: TEST_PASSWORD,
    });
    expect(early.status).toBe(409);
    expect(early.body.error.reason).toBe('not_returned');
    const wrong = await post(t, people.receiving.cookie, `/api/warranty/claims/${number}/return`, { password: 'nope' });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.code).toBe('signature_refused');
    const item = (await Item.findOne({ where: { serial: unit } }))!;
    expect(item.status).toBe('shipped');
    expect(await Shipment.count({ where: { unitItemId: item.id, returnedAt: null } })).toBe(1);

    expect(
      (await post(t, people.operator.cookie, `/api/warranty/claims/${number}/return`, { password: TEST_PASSWORD }))
        .status,
    ).toBe(403);
    const back = await post(t, people.receiving.cookie, `/api/warranty/claims/${number}/return`, {
      note: 'Crate dented, unit dry',
      password: TEST_PASSWORD,
    });
    expect(back.status).toBe(200);
    expect(back.body).toMatchObject({ next: 'teardown', unitReturned: true, returnedBy: 'Dock Receiver' });
    await item.reload();
    expect(item.status).toBe('returned');
    expect(await Shipment.count({ where: { unitItemId: item.id, returnedAt: null } })).toBe(0);
    const sigs = await signaturesOf(number);
    expect(sigs.at(-1)).toMatchObject({
      printedName: 'Dock Receiver',
      meaning: `Received ${unit} back under claim ${number}`,
      reason: 'Crate dented, unit dry',
    });
    expect((await eventsOf(number)).map((e) => e.action)).toEqual([
      'warranty_claim.received',
      'warranty_claim.unit_returned',
    ]);
    expect(await AuditEvent.count({ where: { entity: 'item', entityId: unit, action: 'item.returned' } })).toBe(1);
    // the release gate: no longer "already shipped", but back under a claim
    const gate = await get(t, people.shipping.cookie, `/api/units/${unit}/release-check`);
    const codes = gate.body.reasons.map((r: { code: string }) => r.code);
    expect(codes).toContain('returned');
    expect(codes).not.toContain('shipped');
    expect(
      (await post(t, people.receiving.cookie, `/api/warranty/claims/${number}/return`, { password: TEST_PASSWORD }))
        .status,
    ).toBe(409);
    expect(
      await MailOutbox.count({
        where: {
          subject: `Claim ${number}: ${unit} is back at the plant, ready for teardown`,
          toAddress: people.desk.user.email,
        },
      }),
    ).toBe(1);
  });

  it('when the teardown is recorded, then each finding sits beside what was measured on that part when it was built', async () => {
    const copy = next();
    const number = await returnedClaim(t, people, copy.unit);
    const before = (await get(t, people.operator.cookie, `/api/warranty/claims/${number}`)).body as ClaimJson;
    const block = before.parts.find((p) => p.kind === 'block')!;
    const bore = block.characteristics.find((c) => c.code === 'bore')!;
    const position = bore.positions[0]!;
    const lot = before.lots[0]!;
    const res = await post(t, people.operator.cookie, `/api/warranty/claims/${number}/teardown`, {
      findings: [
        {
          part: block.serial,
          causeCode: 'INSTALL',
          description: 'Scoring on cylinder 1 from a blocked oil cooler line',
          measurements: [{ characteristic: 'bore', position: position.code, value: 3.6275 }],
        },
        { lotCode: lot.lotCode, causeCode: 'NTF', description: 'Bearings as new, no wear pattern' },
      ],
      notes: 'Stripped on bench 2',
      password: TEST_PASSWORD,
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const claim = res.body as ClaimJson;
    expect(claim).toMatchObject({
      state: 'torn_down',
      next: 'decide',
      tornDownBy: 'Teardown Operator',
      teardownNotes: 'Stripped on bench 2',
    });
    const [onBlock, onLot] = claim.findings;
    expect(onBlock!.subject).toMatchObject({ kind: 'item', serial: block.serial, kindLabel: 'Block' });
    expect(onBlock!.measurements).toEqual([
      {
        characteristic: 'bore',
        name: bore.name,
        position: position.code,
        positionLabel: position.label,
        value: 3.6275,
        unit: 'in',
      },
    ]);
    // the built side: the block's own bore-and-hone result, with the reading at that position
    const honed = onBlock!.built.find((r) => r.stage.code === 'bore-hone')!;
    expect(honed).toMatchObject({ station: 'BH-1', verdict: 'pass', superseded: false });
    expect(honed.operator).not.toBe('');
    const reading = honed.readings.find((r) => r.characteristic === 'bore' && r.position === position.code)!;
    expect(reading.ruleVersion).toBeGreaterThanOrEqual(1);
    expect(reading.gauge).toMatch(/^[A-Z]{2}-\d{3}$/);
    expect(reading.lower).toBeLessThan(reading.upper!);
    expect(onLot!.subject).toMatchObject({ kind: 'lot', lotCode: lot.lotCode });
    expect(onLot!.built.map((r) => r.stage.code)).toContain('long-block-assembly');
    // the parts are out of the unit, their links ended with the claim as the reason; the unit is torn down
    const unit = (await Item.findOne({ where: { serial: copy.unit } }))!;
    expect(unit.status).toBe('torn_down');
    const links = await ItemLink.findAll({ where: { parentItemId: unit.id, linkType: 'installed_in' } });
    expect(links.length).toBeGreaterThan(0);
    for (const l of links) expect(l.removedReason).toBe(`Taken out at the teardown of warranty claim ${number}`);
    expect((await Item.findOne({ where: { serial: block.serial } }))!.status).toBe('returned');
    const sig = (await signaturesOf(number)).at(-1)!;
    expect(sig).toMatchObject({
      printedName: 'Teardown Operator',
      meaning: `Recorded the teardown of ${copy.unit} for claim ${number}`,
    });
    const event = (await eventsOf(number)).at(-1)!;
    expect(event.action).toBe('warranty_claim.torn_down');
    expect((event.after as { findings: unknown[] }).findings).toHaveLength(2);
    const mail = await MailOutbox.findOne({
      where: { toAddress: people.quality.user.email, subject: { [Op.like]: `Claim ${number}: teardown%` } },
    });
    expect(mail!.bodyText).toContain('INSTALL');
    // a finding is a record: the database refuses to change it
    await expect(
      WarrantyFinding.update(
        { description: 'x' },
        { where: { claimId: (await WarrantyClaim.findOne({ where: { number } }))!.id } },
      ),
    ).rejects.toThrow(/records/);
  });

  it('when a finding names a part not in the unit, a characteristic never measured on it, or an unknown cause, then 400 names each and nothing is written', async () => {
    const copy = next();
    const other = next();
    const number = await returnedClaim(t, people, copy.unit);
    const block = copy.parts.find((p) => p.kind === 'block')!.serial;
    const res = await post(t, people.operator.cookie, `/api/warranty/claims/${number}/teardown`, {
      findings: [
        { part: other.parts[0]!.serial, causeCode: 'NTF', description: 'Looks fine to me' },
        { part: block, causeCode: 'NO-SUCH', description: 'Scored bore' },
        {
          part: block,
          causeCode: 'NTF',
          description: 'Measured again',
          measurements: [{ characteristic: 'valve-seat-runout', value: 1 }],
        },
        { part: block, lotCode: 'ANY', causeCode: 'NTF', description: 'Both named' },
      ],
      password: TEST_PASSWORD,
    });
    // the shape is checked first: a finding names a part or a lot, not both
    expect(res.status).toBe(400);
    expect(res.body.error.fields['findings.3.part']).toMatch(/one of them/);
    const fixed = await post(t, people.operator.cookie, `/api/warranty/claims/${number}/teardown`, {
      findings: [
        { part: other.parts[0]!.serial, causeCode: 'NTF', description: 'Looks fine to me' },
        { part: block, causeCode: 'NO-SUCH', description: 'Scored bore' },
        {
          part: block,
          causeCode: 'NTF',
          description: 'Measured again',
          measurements: [{ characteristic: 'valve-seat-runout', value: 1 }],
        },
      ],
      password: TEST_PASSWORD,
    });
    expect(fixed.status).toBe(400);
    expect(Object.keys(fixed.body.error.fields).sort()).toEqual([
      'findings.0.part',
      'findings.1.causeCode',
      'findings.2.measurements.0.characteristic',
    ]);
    const claim = (await WarrantyClaim.findOne({ where: { number } }))!;
    expect(claim.state).toBe('received');
    expect(await WarrantyFinding.count({ where: { claimId: claim.id } })).toBe(0);
    expect((await Item.findOne({ where: { serial: copy.unit } }))!.status).toBe('returned');
  });
});

describe('decision and closure', () => {
  it('when the desk decides after the teardown and closes, then each is signed, audited and the customer is told', async () => {
    const copy = next();
    const number = await returnedClaim(t, people, copy.unit);
    const early = await post(t, people.desk.cookie, `/api/warranty/claims/${number}/decide`, {
      decision: 'accepted',
      reason: 'Bore out of round at teardown',
      password: TEST_PASSWORD,
    });
    expect(early.status).toBe(409);
    expect(early.body.error.allowed).toEqual(['torn_down']);
    const block = copy.parts.find((p) => p.kind === 'block')!.serial;
    await post(t, people.operator.cookie, `/api/warranty/claims/${number}/teardown`, {
      findings: [{ part: block, causeCode: 'INSTALL', description: 'Coolant in the oil from a cracked hose' }],
      password: TEST_PASSWORD,
    });
    const decided = await post(t, people.desk.cookie, `/api/warranty/claims/${number}/decide`, {
      decision: 'goodwill',
      reason: 'Installation fault, but a long-standing customer: parts at our cost',
      password: TEST_PASSWORD,
    });
    expect(decided.status).toBe(200);
    expect(decided.body).toMatchObject({
      state: 'decided',
      decision: 'goodwill',
      decidedBy: 'Claim Desk',
      next: 'close',
    });
    const customer = await mailedCustomer();
    expect(
      await MailOutbox.count({
        where: {
          toAddress: customer.email!,
          subject: `Your warranty claim ${number} on engine ${copy.unit}: goodwill (outside the terms)`,
        },
      }),
    ).toBe(1);
    const again = await post(t, people.desk.cookie, `/api/warranty/claims/${number}/decide`, {
      decision: 'rejected',
      reason: 'Changed my mind',
      password: TEST_PASSWORD,
    });
    expect(again.status).toBe(409);
    const closed = await post(t, people.desk.cookie, `/api/warranty/claims/${number}/close`, {
      password: TEST_PASSWORD,
    });
    expect(closed.body).toMatchObject({ state: 'closed', next: null, closedBy: 'Claim Desk' });
    expect((await signaturesOf(number)).map((s) => s.meaning)).toEqual([
      `Logged warranty claim ${number} on ${copy.unit}`,
      `Received ${copy.unit} back under claim ${number}`,
      `Recorded the teardown of ${copy.unit} for claim ${number}`,
      `Decided claim ${number}: goodwill (outside the terms)`,
      `Closed claim ${number}`,
    ]);
    expect((await eventsOf(number)).map((e) => e.action)).toEqual([
      'warranty_claim.received',
      'warranty_claim.unit_returned',
      'warranty_claim.torn_down',
      'warranty_claim.decided',
      'warranty_claim.closed',
    ]);
    expect(
      (await post(t, people.desk.cookie, `/api/warranty/claims/${number}/close`, { password: TEST_PASSWORD })).status,
    ).toBe(409);
    // closed, the unit may carry a new claim once it is back in the field
    expect((await get(t, people.desk.cookie, `/api/warranty/claims?q=${number}`)).body.rows[0]).toMatchObject({
      state: 'closed',
    });
  });

  it('when a claim is outside the terms, then it can be rejected before any teardown, with the reason', async () => {
    const unit = next().unit;
    await shippedOn(t, unit, '2023-01-15');
    const logged = await post(
      t,
      people.desk.cookie,
      '/api/warranty/claims',
      claimBody(unit, customerId, { distanceKm: 240_000 }),
    );
    expect(logged.body.covered).toBe(false);
    const res = await post(t, people.desk.cookie, `/api/warranty/claims/${logged.body.number}/decide`, {
      decision: 'rejected',
      reason: 'Outside the term and past the distance limit',
      password: TEST_PASSWORD,
    });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ decision: 'rejected', unitReturned: false });
    // the unit never came back: it is still in the field
    expect((await Item.findOne({ where: { serial: unit } }))!.status).toBe('shipped');
  });

  it('when a step has bad input or a wrong password, then 4xx and the claim is unchanged', async () => {
    const copy = next();
    const number = await returnedClaim(t, people, copy.unit);
    const url = `/api/warranty/claims/${number}`;
    expect(
      (await post(t, people.desk.cookie, `${url}/decide`, { decision: 'maybe', reason: 'x', password: TEST_PASSWORD }))
        .status,
    ).toBe(400);
    expect(
      (await post(t, people.desk.cookie, `${url}/decide`, { decision: 'rejected', reason: 'No', password: 'wrong' }))
        .status,
    ).toBe(400);
    expect(
      (await post(t, people.operator.cookie, `${url}/teardown`, { findings: [], password: TEST_PASSWORD })).status,
    ).toBe(400);
    expect(
      (
        await post(t, people.operator.cookie, `${url}/teardown`, {
          findings: [{ part: copy.unit, causeCode: 'NTF', description: 'Fine' }],
          password: 'wrong',
        })
      ).status,
    ).toBe(400);
    expect(
      (await post(t, people.desk.cookie, '/api/warranty/claims/WC-26-1/close', { password: TEST_PASSWORD })).status,
    ).toBe(400);
    expect(
      (await post(t, people.desk.cookie, '/api/warranty/claims/WC-2026-99999999/close', { password: TEST_PASSWORD }))
        .status,
    ).toBe(404);
    const claim = (await WarrantyClaim.findOne({ where: { number } }))!;
    expect(claim.state).toBe('received');
    expect(claim.decision).toBeNull();
    expect((await signaturesOf(number)).length).toBe(2);
  });
});

describe('one open claim per unit, raced', () => {
  it('when two desks log a claim on the same unit at once, 30 times, then exactly one of each pair is logged, and the other names it', async () => {
    const copy = next();
    for (let n = 0; n < 30; n++) {
      const offset = Math.round(Math.random() * 20 - 10);
      const send = (ms: number) =>
        new Promise<Awaited<ReturnType<typeof post>>>((resolve) =>
          setTimeout(
            () => resolve(post(t, people.desk.cookie, '/api/warranty/claims', claimBody(copy.unit, customerId))),
            Math.max(0, ms),
          ),
        );
      const [a, b] = await Promise.all([send(offset), send(-offset)]);
      expect([a.status, b.status].sort(), `pair ${n}`).toEqual([201, 409]);
      const [won, lost] = a.status === 201 ? [a, b] : [b, a];
      // the refused one committed after the winner and saw it
      expect(lost.body.error).toMatchObject({ reason: 'claim_open', claim: won.body.number });
      // rejected before any return and closed, the unit may carry the next pair's claim
      const number = won.body.number as string;
      await post(t, people.desk.cookie, `/api/warranty/claims/${number}/decide`, {
        decision: 'rejected',
        reason: 'Drill: nothing to decide',
        password: TEST_PASSWORD,
      });
      await post(t, people.desk.cookie, `/api/warranty/claims/${number}/close`, { password: TEST_PASSWORD });
    }
    expect(await claimsOn(copy.unit)).toBe(30);
    expect(
      await WarrantyClaim.count({
        where: { unitItemId: (await Item.findOne({ where: { serial: copy.unit } }))!.id, state: { [Op.ne]: 'closed' } },
      }),
    ).toBe(0);
  }, 120_000);
});
