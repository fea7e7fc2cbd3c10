import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, Gauge, GaugeStudy, Signature } from '../../server/models/index.js';
import type { StudyJson } from '../../shared/schemas/gauges.js';
import { TEST_PASSWORD, cookieFor, makeTestApp, makeUser, unique, type TestApp } from '../support/app.js';
import { formFor, passThrough, plantToday, tornDownCore } from '../support/parts.js';
import { AIAG_READINGS } from '../unit/fixtures/msa-aiag.js';

/** Gauge studies as records: recorded with an audit event, approved with a signature, flagging the gauge. */

let t: TestApp;
let quality: string;
let operator: string;
let receiving: string;

beforeAll(async () => {
  t = makeTestApp();
  quality = await cookieFor(await makeUser('quality', { name: 'Study Quality', quickSignature: true }), t.config);
  operator = await cookieFor(await makeUser('operator'), t.config);
  receiving = await cookieFor(await makeUser('receiving'), t.config);
});
afterAll(() => t.close());

const post = (cookie: string, url: string, body: object = {}) =>
  request(t.app).post(url).set('Cookie', cookie).send(body);
const get = (cookie: string, url: string) => request(t.app).get(url).set('Cookie', cookie);

async function calibratedGauge() {
  const code = `ZS-${randomUUID().slice(0, 6).toUpperCase()}`;
  const reg = await post(quality, '/api/gauges', {
    code,
    description: 'Study bore gauge 3–6 in',
    kind: 'bore gauge',
    serial: unique('SN'),
    unit: 'in',
    resolution: 0.0001,
    rangeLow: 3,
    rangeHigh: 6,
    intervalDays: 180,
  });
  expect(reg.status, JSON.stringify(reg.body)).toBe(201);
  const cal = await post(quality, `/api/gauges/${code}/calibrations`, {
    calibratedOn: plantToday(),
    performedBy: 'in_house',
    performer: 'Test bench',
    points: [{ reference: 3.5, asFound: 3.5, asLeft: 3.5, tolerance: 0.0001 }],
  });
  expect(cal.status, JSON.stringify(cal.body)).toBe(201);
  return code;
}

const aiagStudy = (method: 'range' | 'anova', tolerance: number | null) => ({
  method,
  characteristic: 'Reference parts, AIAG example',
  tolerance,
  readings: AIAG_READINGS,
});

describe('a variable gauge study as a record', () => {
  it('when the AIAG example is recorded with a tolerance of 6, then %GRR of tolerance is over 30 %, the gauge is flagged at the station and on its page, and an audit event is written', async () => {
    const code = await calibratedGauge();
    const res = await post(quality, `/api/gauges/${code}/studies`, aiagStudy('range', 6));
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const study = res.body as StudyJson;
    const result = study.result as { sigma: { grr: number }; percentOfTolerance: { grr: number }; ndc: number };
    // AIAG MSA 4th ed. worked example (tests/unit/gauge-rr-range.test.ts): GRR σ 0.30575; 6σ / 6.0 → 30.58 %
    expect(result.sigma.grr).toBeCloseTo(0.30575, 4);
    expect(result.percentOfTolerance.grr).toBeCloseTo(30.58, 2);
    expect(result.ndc).toBe(5); // same worked example: ndc 5
    expect(study.verdict).toBe('unacceptable'); // AIAG guideline: over 30 % unacceptable
    expect(study.data).toEqual({ readings: AIAG_READINGS });
    expect(study.approval).toBeNull();

    expect((await Gauge.findOne({ where: { code } }))!.studyVerdict).toBe('unacceptable');
    const page = await get(quality, `/api/gauges/${code}`);
    expect(page.body.gauge.studyVerdict).toBe('unacceptable');
    const event = await AuditEvent.findOne({ where: { action: 'gauge.studied', entityId: code } });
    expect(event!.after).toMatchObject({ studyId: study.id, method: 'range', verdict: 'unacceptable' });

    // the station still lists the gauge, with its failed study named
    const parts = await tornDownCore(t, { receiving, operator }, 'TARN-6');
    await passThrough(t, operator, ['CLN-1', 'MPI-1', 'PT-1', 'LH-1'], parts.block);
    const form = await formFor(t, operator, 'BH-1', parts.block);
    expect(form.gauges.find((g) => g.code === code)).toMatchObject({ usable: true, studyFailed: true });

    // a later study that passes clears the flag: the last study decides
    const again = await post(quality, `/api/gauges/${code}/studies`, aiagStudy('anova', 20));
    expect(again.status, JSON.stringify(again.body)).toBe(201);
    // AIAG example by ANOVA: GRR² 0.091428 (tests/unit/gauge-rr-anova.test.ts), σ 0.3024; 6σ / 20 = 9.1 % → acceptable
    expect((again.body as StudyJson).verdict).toBe('acceptable');
    const after = await formFor(t, operator, 'BH-1', parts.block);
    expect(after.gauges.find((g) => g.code === code)).toMatchObject({ studyFailed: false });

    const list = await get(quality, `/api/gauges/${code}/studies`);
    expect(list.body.map((s: StudyJson) => s.method)).toEqual(['anova', 'range']); // newest first
  });

  it('when a study’s grid is ragged or the method cannot take its shape, then a 400 names the problem and nothing is written', async () => {
    const code = await calibratedGauge();
    const gaugeId = (await Gauge.findOne({ where: { code } }))!.id;
    const before = await GaugeStudy.count({ where: { gaugeId } });
    const ragged = AIAG_READINGS.map((byPart, a) => (a === 1 ? byPart.slice(0, 9) : byPart));
    const r1 = await post(quality, `/api/gauges/${code}/studies`, { ...aiagStudy('range', 6), readings: ragged });
    expect(r1.status).toBe(400);
    expect(r1.body.error.message).toMatch(/appraiser 2 measured 9 parts, not 10/);
    // 12 parts: beyond the K3 table of the average-and-range method (AIAG gives K3 for 2–10 parts)
    const twelve = AIAG_READINGS.map((byPart) => [...byPart, byPart[0]!, byPart[1]!]);
    const r2 = await post(quality, `/api/gauges/${code}/studies`, { ...aiagStudy('range', 6), readings: twelve });
    expect(r2.status).toBe(400);
    expect(r2.body.error.message).toMatch(/2 to 10 parts; use the ANOVA method/);
    const r3 = await post(quality, `/api/gauges/${code}/studies`, { ...aiagStudy('range', -1) });
    expect(r3.status).toBe(400);
    const r4 = await post(quality, `/api/gauges/${code}/studies`, {
      method: 'attribute',
      characteristic: 'Crack test',
      ratings: [[['pass', 'pass']], [['pass', 'pass']]],
      reference: null,
    });
    expect(r4.status).toBe(400);
    expect(await GaugeStudy.count({ where: { gaugeId } })).toBe(before);
    expect((await Gauge.findOne({ where: { code } }))!.studyVerdict).toBeNull();
  });
});

describe('an attribute agreement study', () => {
  it('when a pass/fail check is studied with or without the right answers, then both are recorded with kappa', async () => {
    const code = await calibratedGauge();
    // counted from the data: appraiser 2 calls good part 3 bad once; everything else matches
    const reference = ['pass', 'pass', 'pass', 'fail', 'fail', 'fail'] as const;
    const ratings = [0, 1].map((a) => reference.map((r, p) => [r, a === 1 && p === 2 ? 'fail' : r]));
    const known = await post(quality, `/api/gauges/${code}/studies`, {
      method: 'attribute',
      characteristic: 'Crack test, block deck',
      ratings,
      reference,
    });
    expect(known.status, JSON.stringify(known.body)).toBe(201);
    const r = (known.body as StudyJson).result as {
      appraisers: { falseAlarms: { count: number; of: number } }[];
      overallKappa: { kappa: number };
    };
    expect(r.appraisers[1]!.falseAlarms).toMatchObject({ count: 1, of: 6 });
    // 16.7 % false alarms is over the 10 % band (AIAG MSA 4th ed. guideline, from memory)
    expect((known.body as StudyJson).verdict).toBe('unacceptable');
    // Fleiss (1971) with the 4 judgements of each part as raters, worked by hand: P̄ = 5.5 / 6,
    // Pe = (11/24)² + (13/24)² = 290/576, κ = (P̄ − Pe) / (1 − Pe) = 0.8322
    expect(r.overallKappa.kappa).toBeCloseTo(0.8322, 4);

    const blind = await post(quality, `/api/gauges/${code}/studies`, {
      method: 'attribute',
      characteristic: 'Crack test, block deck',
      ratings,
      reference: null,
    });
    expect(blind.status, JSON.stringify(blind.body)).toBe(201);
    expect((blind.body as StudyJson).data).toMatchObject({ reference: null });
  });
});

describe('approving a gauge study', () => {
  async function recorded() {
    const code = await calibratedGauge();
    const res = await post(quality, `/api/gauges/${code}/studies`, aiagStudy('anova', 20));
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    return { code, id: (res.body as StudyJson).id };
  }

  it('when quality approves with the password, then a signature with signer, meaning, reason and time is kept, with its audit event, once', async () => {
    const { code, id } = await recorded();
    const wrong = await post(quality, `/api/gauge-studies/${id}/approval`, {
      reason: 'Study reviewed with the appraisers',
      password: 'not the password',
    });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.code).toBe('signature_refused');
    expect(await Signature.count({ where: { entity: 'gauge_study', entityId: String(id) } })).toBe(0);

    const ok = await post(quality, `/api/gauge-studies/${id}/approval`, {
      reason: 'Study reviewed with the appraisers',
      password: TEST_PASSWORD,
    });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    const approval = (ok.body as StudyJson).approval!;
    expect(approval).toMatchObject({
      printedName: 'Study Quality',
      reason: 'Study reviewed with the appraisers',
      meaning: expect.stringMatching(new RegExp(`Approved the ANOVA gauge R&R study of ${code}`)),
    });
    expect(Math.abs(Date.parse(approval.signedAt) - Date.now())).toBeLessThan(60_000);
    const event = await AuditEvent.findOne({ where: { action: 'gauge_study.approved', entityId: String(id) } });
    expect(event!.after).toMatchObject({ approved: true, gauge: code, signedBy: 'Study Quality' });

    const twice = await post(quality, `/api/gauge-studies/${id}/approval`, {
      reason: 'Approve it again',
      password: TEST_PASSWORD,
    });
    expect(twice.status).toBe(409);
    expect(await Signature.count({ where: { entity: 'gauge_study', entityId: String(id) } })).toBe(1);
    const list = await get(quality, `/api/gauges/${code}/studies`);
    expect(list.body[0].approval).toMatchObject({ printedName: 'Study Quality' });
  });

  it('when two approvals of one study race, then exactly one signature is kept and the other is refused', async () => {
    const { id } = await recorded();
    const body = { reason: 'Raced approval of the study', password: TEST_PASSWORD };
    const [a, b] = await Promise.all([
      post(quality, `/api/gauge-studies/${id}/approval`, body),
      post(quality, `/api/gauge-studies/${id}/approval`, body),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    expect(await Signature.count({ where: { entity: 'gauge_study', entityId: String(id) } })).toBe(1);
  });

  it('when the approval is bad input, from the wrong role or of no study, then a clear 4xx and nothing is signed', async () => {
    const { id } = await recorded();
    const short = await post(quality, `/api/gauge-studies/${id}/approval`, { reason: 'ok', password: TEST_PASSWORD });
    expect(short.status).toBe(400);
    expect(short.body.error.fields).toHaveProperty('reason');
    const extra = await post(quality, `/api/gauge-studies/${id}/approval`, {
      reason: 'Reviewed and fine',
      password: TEST_PASSWORD,
      verdict: 'acceptable',
    });
    expect(extra.status).toBe(400);
    const byOperator = await post(operator, `/api/gauge-studies/${id}/approval`, {
      reason: 'Reviewed and fine',
      password: TEST_PASSWORD,
    });
    expect(byOperator.status).toBe(403);
    const none = await post(quality, `/api/gauge-studies/2147483647/approval`, {
      reason: 'Reviewed and fine',
      password: TEST_PASSWORD,
    });
    expect(none.status).toBe(404);
    const notId = await post(quality, `/api/gauge-studies/abc/approval`, {
      reason: 'Reviewed and fine',
      password: TEST_PASSWORD,
    });
    expect(notId.status).toBe(400);
    expect(await Signature.count({ where: { entity: 'gauge_study', entityId: String(id) } })).toBe(0);
  });
});
