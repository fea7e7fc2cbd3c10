import { randomInt, randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeSerial } from '../../shared/domain/serial.js';
import { TEST_PASSWORD, makeTestApp, type TestApp } from '../support/app.js';
import { tornDownCore } from '../support/parts.js';
import {
  claimBody,
  claimPeople,
  mailedCustomer,
  returnedClaim,
  shippedUnits,
  type ClaimPeople,
} from '../support/warranty.js';

/**
 * Issue 20's "bad input: clear 4xx and nothing written, on every new route". Every route under
 * /api/warranty, /api/corrective-actions and a core's credit revisions gets input it must refuse;
 * each must answer 4xx with the error shape and leave the records it could touch as they were.
 * The route list is read from the app, so a new route without a case here fails the test.
 */

let t: TestApp;
let people: ClaimPeople;
let claim: string;
let ca: string;
let taskId: number;
let core: string;
let unclaimed: string;
let cause: string;

const NEW_ROUTES = /^\/api\/(warranty\/|corrective-actions|cores\/:serial\/credit-revisions)/;

beforeAll(async () => {
  t = makeTestApp();
  people = await claimPeople(t);
  const [a, b] = await shippedUnits(t, people, 2);
  claim = await returnedClaim(t, people, a!.unit);
  unclaimed = b!.unit;
  const opened = await request(t.app)
    .post('/api/corrective-actions')
    .set('Cookie', people.quality.cookie)
    .send({ title: `Bad input ${randomUUID().slice(0, 6)}`, problem: 'A problem', claims: [claim] });
  if (opened.status !== 201) throw new Error(JSON.stringify(opened.body));
  ca = opened.body.number;
  const task = await request(t.app)
    .post(`/api/corrective-actions/${ca}/actions`)
    .set('Cookie', people.quality.cookie)
    .send({
      kind: 'corrective',
      description: 'Change the stones',
      ownerId: people.operator.user.id,
      dueOn: '2099-01-01',
    });
  if (task.status !== 201) throw new Error(JSON.stringify(task.body));
  taskId = task.body.actions[0].id;
  core = (await tornDownCore(t, { receiving: people.receiving.cookie, operator: people.operator.cookie }, 'TARN-6'))
    .core;
  cause = `BI${randomUUID().slice(0, 6).toUpperCase()}`;
  const made = await request(t.app)
    .post('/api/warranty/cause-codes')
    .set('Cookie', people.quality.cookie)
    .send({ code: cause, description: 'Made for the bad-input test', countsAsFailure: true });
  if (made.status !== 201) throw new Error(JSON.stringify(made.body));
}, 240_000);
afterAll(() => t.close());

/**
 * Everything the refused requests could have touched, as rows: the claim and its findings, the
 * corrective action and all that hangs off it, the core's credit revisions, the cause code, any
 * claim on the unclaimed unit, and the signatures, audit events and mail that name any of these.
 */
async function touchable() {
  const rows = (sql: string) =>
    t.sequelize.query(sql, {
      type: QueryTypes.SELECT,
      replacements: { claim, ca, core, cause, unclaimed },
    });
  return {
    claim: await rows(`SELECT c.*, (SELECT count(*) FROM warranty_findings f WHERE f.claim_id = c.id) AS findings
                         FROM warranty_claims c WHERE c.number = :claim`),
    unclaimed: await rows(`SELECT c.id FROM warranty_claims c JOIN items i ON i.id = c.unit_item_id
                            WHERE i.serial = :unclaimed`),
    ca: await rows(`SELECT ca.*,
                      (SELECT json_agg(t ORDER BY t.id) FROM corrective_action_tasks t WHERE t.corrective_action_id = ca.id) AS tasks,
                      (SELECT count(*) FROM corrective_action_sources s WHERE s.corrective_action_id = ca.id) AS sources,
                      (SELECT count(*) FROM corrective_action_members m WHERE m.corrective_action_id = ca.id) AS members,
                      (SELECT count(*) FROM corrective_action_containment x WHERE x.corrective_action_id = ca.id) AS containment
                     FROM corrective_actions ca WHERE ca.number = :ca`),
    credit: await rows(`SELECT r.* FROM core_credit_revisions r JOIN items i ON i.id = r.core_item_id
                         WHERE i.serial = :core ORDER BY r.id`),
    cause: await rows(`SELECT * FROM cause_codes WHERE code = :cause`),
    signatures: await rows(`SELECT id FROM signatures WHERE entity_id IN (:claim, :ca, :core) ORDER BY id`),
    audit: await rows(
      `SELECT id FROM audit_events WHERE entity_id IN (:claim, :ca, :core, :cause, :unclaimed) ORDER BY id`,
    ),
    mail: await rows(`SELECT id FROM mail_outbox
                       WHERE subject LIKE '%' || :claim || '%' OR subject LIKE '%' || :ca || '%'
                          OR subject LIKE '%' || :unclaimed || '%' ORDER BY id`),
  };
}

type Case = { as: keyof ClaimPeople; send: () => request.Test };

/** One refusal per route (method and path as the app lists them); `null` for a route that takes no input. */
function cases(): Record<string, Case | null> {
  const as = (who: keyof ClaimPeople) => people[who].cookie;
  const get = (who: keyof ClaimPeople, url: string) => () => request(t.app).get(url).set('Cookie', as(who));
  const send = (who: keyof ClaimPeople, method: 'post' | 'put' | 'patch', url: string, body: unknown) => () =>
    request(t.app)
      [method](url)
      .set('Cookie', as(who))
      .send(body as object);
  const c = (who: keyof ClaimPeople, f: (w: keyof ClaimPeople) => () => request.Test): Case => ({
    as: who,
    send: f(who),
  });
  return {
    'get /api/warranty/coverage': c('desk', (w) =>
      get(w, `/api/warranty/coverage?serial=${unclaimed}&failedOn=tomorrow`),
    ),
    'get /api/warranty/claims': c('desk', (w) => get(w, '/api/warranty/claims?state=lost')),
    'post /api/warranty/claims': c('desk', (w) =>
      send(w, 'post', '/api/warranty/claims', { ...claimBody(unclaimed, 1), distanceKm: -5, hours: null }),
    ),
    'get /api/warranty/claims/:number': c('desk', (w) => get(w, '/api/warranty/claims/CLAIM-7')),
    'post /api/warranty/claims/:number/return': c('receiving', (w) =>
      send(w, 'post', `/api/warranty/claims/${claim}/return`, { password: TEST_PASSWORD, crate: 'open' }),
    ),
    'post /api/warranty/claims/:number/teardown': c('operator', (w) =>
      send(w, 'post', `/api/warranty/claims/${claim}/teardown`, { findings: [], password: TEST_PASSWORD }),
    ),
    'post /api/warranty/claims/:number/decide': c('desk', (w) =>
      send(w, 'post', `/api/warranty/claims/${claim}/decide`, {
        decision: 'maybe',
        reason: 'Not sure yet',
        password: TEST_PASSWORD,
      }),
    ),
    'post /api/warranty/claims/:number/close': c('desk', (w) =>
      send(w, 'post', `/api/warranty/claims/${claim}/close`, { note: 42, password: TEST_PASSWORD }),
    ),
    'get /api/warranty/cause-codes': null,
    'post /api/warranty/cause-codes': c('quality', (w) =>
      send(w, 'post', '/api/warranty/cause-codes', { code: 'a b', description: 'x', countsAsFailure: 'yes' }),
    ),
    'patch /api/warranty/cause-codes/:code': c('quality', (w) =>
      send(w, 'patch', `/api/warranty/cause-codes/${cause}`, { countsAsFailure: 'sometimes' }),
    ),
    'get /api/warranty/analysis': c('quality', (w) => get(w, '/api/warranty/analysis?from=yesterday')),
    'get /api/warranty/analysis.csv': c('quality', (w) => get(w, '/api/warranty/analysis.csv?family=-1')),
    'get /api/warranty/weibull': c('quality', (w) => get(w, '/api/warranty/weibull?to=2026-13-45')),
    'get /api/cores/:serial/credit-revisions': c('receiving', (w) =>
      get(w, '/api/cores/not%20a%20serial/credit-revisions'),
    ),
    'post /api/cores/:serial/credit-revisions': c('receiving', (w) =>
      send(w, 'post', `/api/cores/${core}/credit-revisions`, { creditDecision: 'lots', reason: 'Cracked web' }),
    ),
    'get /api/corrective-actions': c('quality', (w) => get(w, '/api/corrective-actions?state=pending')),
    'get /api/corrective-actions/actions': c('operator', (w) => get(w, '/api/corrective-actions/actions?owner=them')),
    'get /api/corrective-actions/people': null,
    'post /api/corrective-actions': c('quality', (w) =>
      send(w, 'post', '/api/corrective-actions', { title: 'Bad sources here', ncrs: ['NC-1'], claims: [] }),
    ),
    'get /api/corrective-actions/:number': c('quality', (w) => get(w, '/api/corrective-actions/CA-ONE')),
    'patch /api/corrective-actions/:number': c('quality', (w) =>
      send(w, 'patch', `/api/corrective-actions/${ca}`, { verificationDueOn: 'soon', rootCause: 'Stones' }),
    ),
    'post /api/corrective-actions/:number/sources': c('quality', (w) =>
      send(w, 'post', `/api/corrective-actions/${ca}/sources`, { ncr: 'NC-2026-00001', claim }),
    ),
    'put /api/corrective-actions/:number/team': c('quality', (w) =>
      send(w, 'put', `/api/corrective-actions/${ca}/team`, { members: [{ userId: 'me' }] }),
    ),
    'post /api/corrective-actions/:number/containment': c('quality', (w) =>
      send(w, 'post', `/api/corrective-actions/${ca}/containment`, { note: 'held' }),
    ),
    'post /api/corrective-actions/:number/evidence': c('quality', (w) =>
      send(w, 'post', `/api/corrective-actions/${ca}/evidence`, { attachmentIds: [] }),
    ),
    'post /api/corrective-actions/:number/actions': c('quality', (w) =>
      send(w, 'post', `/api/corrective-actions/${ca}/actions`, {
        kind: 'corrective',
        description: 'Change the stones',
        ownerId: people.operator.user.id,
        dueOn: '31/12/2099',
      }),
    ),
    'post /api/corrective-actions/:number/actions/:id/done': c('operator', (w) =>
      send(w, 'post', `/api/corrective-actions/${ca}/actions/${taskId}/done`, { note: '' }),
    ),
    'post /api/corrective-actions/:number/verify': c('quality', (w) =>
      send(w, 'post', `/api/corrective-actions/${ca}/verify`, { effective: 'yes', note: 'It worked well' }),
    ),
    'post /api/corrective-actions/:number/close': c('quality', (w) =>
      send(w, 'post', `/api/corrective-actions/${ca}/close`, { reason: 'All done here' }),
    ),
  };
}

describe('bad input on every new route of issue 20', () => {
  it('when the app lists its routes, then each new one has a refusal case here (or takes no input)', () => {
    const listed = t.app.apiRoutes.filter((r) => NEW_ROUTES.test(r.path)).map((r) => `${r.method} ${r.path}`);
    expect(listed.length).toBeGreaterThan(25);
    expect(listed.sort()).toEqual(Object.keys(cases()).sort());
  });

  it('when each new route is sent input it must refuse, then 400 with the fields named, and nothing is written', async () => {
    for (const [route, c] of Object.entries(cases())) {
      if (!c) continue;
      const before = await touchable();
      const res = await c.send();
      expect({ route, status: res.status }).toEqual({ route, status: 400 });
      expect(res.body.error.code, route).toBe('invalid');
      expect(typeof res.body.error.message, route).toBe('string');
      expect(Object.keys(res.body.error.fields ?? {}).length, route).toBeGreaterThan(0);
      expect(await touchable(), route).toEqual(before);
    }
  });

  it('when the input is well formed but names what does not exist or cannot be, then 4xx and nothing is written', async () => {
    const customer = (await mailedCustomer()).id;
    const q = people.quality.cookie;
    const refusals: [string, () => request.Test, number][] = [
      [
        'a claim on a well-formed serial that no unit carries',
        () =>
          request(t.app)
            .post('/api/warranty/claims')
            .set('Cookie', people.desk.cookie)
            .send(claimBody(makeSerial('long_block', randomInt), customer)),
        404,
      ],
      [
        'a claim on a serial whose check character is wrong',
        () =>
          request(t.app)
            .post('/api/warranty/claims')
            .set('Cookie', people.desk.cookie)
            .send(claimBody(`${unclaimed.slice(0, -1)}${unclaimed.endsWith('A') ? 'B' : 'A'}`, customer)),
        400,
      ],
      [
        'a corrective action from an NCR that does not exist',
        () =>
          request(t.app)
            .post('/api/corrective-actions')
            .set('Cookie', q)
            .send({ title: 'Unknown sources', ncrs: ['NC-1999-99999'] }),
        400,
      ],
      [
        'an action due yesterday',
        () =>
          request(t.app).post(`/api/corrective-actions/${ca}/actions`).set('Cookie', q).send({
            kind: 'preventive',
            description: 'Too late for this',
            ownerId: people.operator.user.id,
            dueOn: '2000-01-01',
          }),
        400,
      ],
      [
        'a closure with open actions',
        () =>
          request(t.app)
            .post(`/api/corrective-actions/${ca}/close`)
            .set('Cookie', q)
            .send({ reason: 'Closing early', password: TEST_PASSWORD }),
        409,
      ],
      [
        'a decision signed with the wrong password',
        () =>
          request(t.app)
            .post(`/api/warranty/claims/${claim}/decide`)
            .set('Cookie', people.desk.cookie)
            .send({ decision: 'rejected', reason: 'Outside the terms', password: 'not the password' }),
        400,
      ],
    ];
    for (const [what, send, status] of refusals) {
      const before = await touchable();
      const res = await send();
      expect({ what, status: res.status }).toEqual({ what, status });
      expect(typeof res.body.error.message, what).toBe('string');
      expect(await touchable(), what).toEqual(before);
    }
    // and the claim on the unclaimed unit, logged properly, is written: the checks above can see a write
    const logged = await request(t.app)
      .post('/api/warranty/claims')
      .set('Cookie', people.desk.cookie)
      .send(claimBody(unclaimed, customer));
    expect(logged.status).toBe(201);
    expect((await touchable()).unclaimed).toHaveLength(1);
  });
});
