import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nominalSizeClasses, passingReadings } from '../../db/seeders/sample-readings.js';
import { AuditEvent, Item, StageResult } from '../../server/models/index.js';
import { cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';
import { formFor, gaugesOf, tornDownCore } from '../support/parts.js';

let t: TestApp;
let receiving: string;
let operator: string;

beforeAll(async () => {
  t = makeTestApp();
  receiving = await cookieFor(await makeUser('receiving'), t.config);
  operator = await cookieFor(await makeUser('operator'), t.config);
});
afterAll(() => t.close());

const MINUTE = 60_000;

/** A block at its first stage after teardown, with the body a tablet would send for it there. */
async function cleanBody(extra: Record<string, unknown>) {
  const { block } = await tornDownCore(t, { receiving, operator }, 'TARN-6');
  const form = await formFor(t, operator, 'CLN-1', block);
  return {
    idempotencyKey: randomUUID(),
    serial: block,
    station: 'CLN-1',
    ...gaugesOf(form),
    readings: passingReadings(form),
    sizeClasses: nominalSizeClasses(form),
    ...extra,
  };
}

const send = (body: Record<string, unknown>) => request(t.app).post('/api/results').set('Cookie', operator).send(body);

async function storedFor(serial: string) {
  const item = (await Item.findOne({ where: { serial } }))!;
  return StageResult.findAll({ where: { itemId: item.id } });
}

describe('when a result was taken on the tablet', () => {
  it('when a result taken 40 minutes ago arrives now, then it keeps the tablet’s time as taken and the server’s as finished, in the reply, the row and the audit', async () => {
    const startedAt = new Date(Date.now() - 45 * MINUTE).toISOString();
    const takenAt = new Date(Date.now() - 40 * MINUTE).toISOString();
    const body = await cleanBody({ startedAt, takenAt });
    const res = await send(body);
    expect(res.status).toBe(201);
    expect(res.body.takenAt).toBe(takenAt);
    expect(Date.parse(res.body.finishedAt) - Date.parse(takenAt)).toBeGreaterThanOrEqual(40 * MINUTE);

    const [row] = await storedFor(body.serial);
    expect(row!.takenAt!.toISOString()).toBe(takenAt);
    const event = await AuditEvent.findOne({ where: { action: 'result.recorded', entityId: String(row!.id) } });
    expect(event!.after).toMatchObject({ takenAt });

    // the same result sent again a moment later, with a fresher time: stored once, the first reply
    const again = await send({ ...body, takenAt: new Date().toISOString() });
    expect(again.status).toBe(201);
    expect(again.body.id).toBe(res.body.id);
    expect(await storedFor(body.serial)).toHaveLength(1);
  });

  it('when a tablet says nothing of when, then the moment of arrival is the taken time', async () => {
    const body = await cleanBody({});
    const res = await send(body);
    expect(res.status).toBe(201);
    expect(res.body.takenAt).toBe(res.body.finishedAt);
  });

  it('when the tablet’s time is ahead of the server, older than a week, or before its form was opened, then it is a 400 on takenAt and nothing is stored', async () => {
    const cases = [
      { takenAt: new Date(Date.now() + 10 * MINUTE).toISOString() },
      { takenAt: new Date(Date.now() - 8 * 24 * 60 * MINUTE).toISOString() },
      {
        startedAt: new Date(Date.now() - 5 * MINUTE).toISOString(),
        takenAt: new Date(Date.now() - 10 * MINUTE).toISOString(),
      },
    ];
    for (const c of cases) {
      const body = await cleanBody(c);
      const res = await send(body);
      expect(res.status).toBe(400);
      expect(Object.keys(res.body.error.fields)).toEqual(['takenAt']);
      expect(await storedFor(body.serial)).toHaveLength(0);
    }
  });
});
