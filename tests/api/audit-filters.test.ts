import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { dateIn } from '../../shared/domain/warranty.js';
import { AuditEvent, PlantSettings } from '../../server/models/index.js';
import { cookieFor, makeTestApp, makeUser, unique, type TestApp } from '../support/app.js';
import { pass, tornDownCore } from '../support/parts.js';

let t: TestApp;
beforeAll(() => {
  t = makeTestApp();
});
afterAll(() => t.close());

const get = (cookie: string, query: Record<string, string | number>) =>
  request(t.app).get('/api/audit/events').query(query).set('Cookie', cookie);

/** A calendar day moved by n days (plain date arithmetic in UTC, no zone involved). */
const shift = (day: string, n: number) =>
  new Date(Date.parse(`${day}T00:00:00Z`) + n * 86_400_000).toISOString().slice(0, 10);

async function addPerson(cookie: string, name: string) {
  const res = await request(t.app)
    .post('/api/people')
    .set('Cookie', cookie)
    .send({ email: `${unique('f')}@test.example`, name, role: 'operator', password: 'long enough pass' });
  expect(res.status).toBe(201);
  return res.body.id as number;
}

describe('the audit trail filters by person and by days', () => {
  it('when an admin adds a person, then the event is found by that admin and by its day in the plant’s calendar, and not the day before or after', async () => {
    const admin = await makeUser('admin', { name: unique('Filter Admin ') });
    const cookie = await cookieFor(admin, t.config);
    const id = await addPerson(cookie, 'Filtered Person');
    const event = (await AuditEvent.findOne({
      where: { entity: 'user', entityId: String(id), action: 'user.created' },
    }))!;
    const zone = (await PlantSettings.findByPk(1))!.timeZone;
    const day = dateIn(zone, event.occurredAt);

    const mine = await get(cookie, { actorId: admin.id });
    expect(mine.status).toBe(200);
    expect(mine.body.rows.every((e: { actorId: number }) => e.actorId === admin.id)).toBe(true);
    expect(mine.body.rows.map((e: { id: number }) => e.id)).toContain(event.id);

    const base = { entity: 'user', entityId: String(id) };
    const ids = async (q: Record<string, string>) =>
      (await get(cookie, { ...base, ...q })).body.rows.map((e: { id: number }) => e.id);
    expect(await ids({ from: day, to: day })).toEqual([event.id]);
    expect(await ids({ from: day })).toEqual([event.id]);
    expect(await ids({ to: day })).toEqual([event.id]);
    expect(await ids({ from: shift(day, 1) })).toEqual([]);
    expect(await ids({ to: shift(day, -1) })).toEqual([]);
  });

  it('when a person is the record, then the trail names them instead of their id', async () => {
    const admin = await makeUser('admin');
    const cookie = await cookieFor(admin, t.config);
    const name = unique('Named Person ');
    const id = await addPerson(cookie, name);
    const res = await get(cookie, { entity: 'user', entityId: String(id) });
    expect(res.body.rows[0]).toMatchObject({ action: 'user.created', recordLabel: name });
  });

  it('when a station records a result, then the trail names it by its stage and serial', async () => {
    const cookies = {
      receiving: await cookieFor(await makeUser('receiving'), t.config),
      operator: await cookieFor(await makeUser('operator'), t.config),
    };
    const parts = await tornDownCore(t, cookies, 'TARN-6');
    const result = await pass(t, cookies.operator, 'CLN-1', parts.block);
    const quality = await cookieFor(await makeUser('quality'), t.config);
    const res = await get(quality, { entity: 'stage_result', entityId: String(result.id) });
    expect(res.status).toBe(200);
    expect(res.body.rows[0].recordLabel).toMatch(new RegExp(`^.+ result of ${parts.block}$`));
  });

  it('when the person filter is listed, then it holds those with events by name, and not someone who has done nothing', async () => {
    const admin = await makeUser('admin', { name: unique('Listed Admin ') });
    const cookie = await cookieFor(admin, t.config);
    await addPerson(cookie, 'Anyone');
    const idle = await makeUser('operator');
    const res = await request(t.app).get('/api/audit/actors').set('Cookie', cookie);
    expect(res.status).toBe(200);
    const ids = res.body.rows.map((a: { id: number }) => a.id);
    expect(ids).toContain(admin.id);
    expect(ids).not.toContain(idle.id);
    expect(res.body.rows.find((a: { id: number }) => a.id === admin.id)).toMatchObject({
      name: admin.name,
      role: 'admin',
      active: true,
    });
    const operator = await cookieFor(await makeUser('operator'), t.config);
    expect((await request(t.app).get('/api/audit/actors').set('Cookie', operator)).status).toBe(403);
  });

  it('when the days are not dates or run backwards, then the request is refused with the field named', async () => {
    const cookie = await cookieFor(await makeUser('admin'), t.config);
    const bad = await get(cookie, { from: '2026-13-40' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty('from');
    const backwards = await get(cookie, { from: '2026-03-02', to: '2026-03-01' });
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.fields.to).toBe('The last day comes before the first.');
  });
});
