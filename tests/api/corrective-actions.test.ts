import { execFile } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { setTimeout as sleep } from 'node:timers/promises';
import PDFDocument from 'pdfkit';
import { Op, QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, CorrectiveAction, MailOutbox, Nonconformance, Signature } from '../../server/models/index.js';
import { sendOverdueReminders } from '../../server/services/corrective-action/reminders.js';
import type { CaJson } from '../../shared/schemas/corrective-action.js';
import { TEST_PASSWORD, cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';
import { pngImage } from '../support/images.js';
import { plantToday, tornDownCore } from '../support/parts.js';
import { claimBody, claimPeople, mailedCustomer, shippedUnits, type ClaimPeople } from '../support/warranty.js';

/**
 * Corrective actions through the API: opened from NCRs and claims, kept in the plant's words,
 * containment linked to holds and field actions, evidence as photos or PDFs, actions with owners
 * and due dates, the check of effectiveness, a closure signed by quality; a closure raced against
 * a new action; one overdue reminder per action per day across processes.
 */

let t: TestApp;
let people: ClaimPeople;
let quality: string;
let qualityUser: Awaited<ReturnType<typeof makeUser>>;
let owner: Awaited<ReturnType<typeof makeUser>>;
let ownerCookie: string;
let ncr: string;
let claim: string;
let shippedUnit: { unit: string; parts: { kind: string; serial: string }[] };

const post = (cookie: string, url: string, body: object = {}) =>
  request(t.app).post(url).set('Cookie', cookie).send(body);
const patch = (cookie: string, url: string, body: object) => request(t.app).patch(url).set('Cookie', cookie).send(body);
const get = (cookie: string, url: string) => request(t.app).get(url).set('Cookie', cookie);
const tomorrowOf = (day: string) => new Date(Date.parse(`${day}T12:00:00Z`) + 86_400_000).toISOString().slice(0, 10);

/** One reminder pass in a separate Node process, as a second API process would run it. */
function reminderPass(day: string): Promise<number> {
  return new Promise((resolve, reject) => {
    execFile(
      process.execPath,
      ['--import', 'tsx', 'tests/support/reminder-pass.ts', day],
      { env: { ...process.env, DATABASE_URL: t.config.DATABASE_URL } },
      (err, stdout) => (err ? reject(err) : resolve(Number(stdout.trim().split('\n').pop()))),
    );
  });
}

function pdfBytes(): Promise<Buffer> {
  const doc = new PDFDocument();
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve) => doc.on('end', () => resolve(Buffer.concat(chunks))));
  doc.text('Metallurgy report: fatigue crack from a casting pore at the main web.');
  doc.end();
  return done;
}

beforeAll(async () => {
  t = makeTestApp();
  people = await claimPeople(t);
  qualityUser = await makeUser('quality', { name: 'CA Quality', quickSignature: true });
  quality = await cookieFor(qualityUser, t.config);
  owner = await makeUser('operator', { name: 'Action Owner' });
  ownerCookie = await cookieFor(owner, t.config);
  const parts = await tornDownCore(
    t,
    { receiving: people.receiving.cookie, operator: people.operator.cookie },
    'TARN-6',
  );
  const raised = await post(people.operator.cookie, '/api/ncrs', {
    serial: parts.block,
    description: 'Porosity in the main web seen after cleaning',
    severity: 'major',
    defectCode: 'CRK',
  });
  ncr = raised.body.number;
  shippedUnit = (await shippedUnits(t, people, 1))[0]!;
  const logged = await post(
    people.desk.cookie,
    '/api/warranty/claims',
    claimBody(shippedUnit.unit, (await mailedCustomer()).id),
  );
  claim = logged.body.number;
}, 240_000);
afterAll(() => t.close());

async function open(extra: object = {}) {
  const res = await post(quality, '/api/corrective-actions', {
    title: `Main bearing failures ${randomUUID().slice(0, 6)}`,
    problem: 'Main bearings fail early in the field',
    ncrs: [ncr],
    claims: [claim],
    ...extra,
  });
  if (res.status !== 201) throw new Error(JSON.stringify(res.body));
  return res.body as CaJson;
}

describe('opening a corrective action', () => {
  it('when quality opens one from a claim and an NCR with a team, then both are its sources, it is audited and the team is mailed', async () => {
    const ca = await open({ team: [{ userId: owner.id, role: 'Machining lead' }] });
    expect(ca.number).toMatch(/^CA-\d{4}-\d{5,}$/);
    expect(ca.sourceList.map((s) => s.number)).toEqual([ncr, claim]);
    expect(ca.team).toEqual([{ userId: owner.id, name: 'Action Owner', role: 'operator', teamRole: 'Machining lead' }]);
    expect(ca.closeBlockers).toContain('Record the root cause and its evidence.');
    const [event] = await AuditEvent.findAll({ where: { entity: 'corrective_action', entityId: ca.number } });
    expect(event).toMatchObject({ action: 'corrective_action.opened' });
    expect(
      await MailOutbox.count({
        where: { toAddress: owner.email, subject: `Corrective action ${ca.number}: you are on the team` },
      }),
    ).toBe(1);
    // the claim page names it
    const c = await get(people.desk.cookie, `/api/warranty/claims/${claim}`);
    expect(c.body.correctiveActions.map((x: { number: string }) => x.number)).toContain(ca.number);
  });

  it('when the input is bad or the role may not, then 4xx and nothing is opened', async () => {
    const title = `Bad ${randomUUID().slice(0, 8)}`;
    const cases: [string, object, number, string?][] = [
      [quality, { title, ncrs: [], claims: [] }, 400, 'ncrs'],
      [quality, { title, ncrs: ['NC-2026-99999999'] }, 400, 'ncrs'],
      [quality, { title, claims: ['WC-2026-99999999'] }, 400, 'claims'],
      [quality, { title, ncrs: ['NCR 7'] }, 400, 'ncrs.0'],
      [quality, { title, ncrs: [ncr], team: [{ userId: 99_999_999 }] }, 400, 'team'],
      [quality, { title: 'abc', ncrs: [ncr] }, 400, 'title'],
      [quality, { title, ncrs: [ncr], owner: 'me' }, 400, 'owner'],
      [people.desk.cookie, { title, ncrs: [ncr] }, 403],
    ];
    for (const [cookie, body, status, field] of cases) {
      const res = await post(cookie, '/api/corrective-actions', body);
      expect(res.status, JSON.stringify(body)).toBe(status);
      if (field) expect(Object.keys(res.body.error.fields ?? {}), JSON.stringify(body)).toContain(field);
    }
    expect(await CorrectiveAction.count({ where: { title } })).toBe(0);
  });
});

describe('from problem to signed closure', () => {
  it('when the record is written, containment linked, evidence attached, actions done and effectiveness checked, then quality signs the closure', async () => {
    const ca = await open();
    const url = `/api/corrective-actions/${ca.number}`;
    // containment: the NCR holding the block, and a field action on a part of the shipped unit
    const crank = shippedUnit.parts.find((p) => p.kind === 'crankshaft')!.serial;
    const late = await post(people.operator.cookie, '/api/ncrs', {
      serial: crank,
      description: 'Same porosity found on a sister casting, this one shipped',
      severity: 'major',
      defectCode: 'CRK',
    });
    const fa = (await get(people.desk.cookie, `/api/field-actions?state=open&pageSize=200`)).body.rows.find(
      (r: { ncr: { number: string } }) => r.ncr.number === late.body.number,
    ).number as string;
    expect((await post(quality, `${url}/containment`, { ncr, note: 'Block held' })).status).toBe(201);
    expect((await post(quality, `${url}/containment`, { fieldAction: fa, note: 'Customer told' })).status).toBe(201);
    expect((await post(quality, `${url}/containment`, { ncr, fieldAction: fa })).status).toBe(400);
    // evidence: a PDF and a photo through the upload path
    const pdf = await request(t.app)
      .post('/api/attachments')
      .set('Cookie', quality)
      .attach('file', await pdfBytes(), 'lab.pdf');
    expect(pdf.status).toBe(201);
    expect(pdf.body.mimeType).toBe('application/pdf');
    const photo = await request(t.app)
      .post('/api/attachments')
      .set('Cookie', quality)
      .attach('file', pngImage(), 'web.png');
    // a PDF is evidence, never a part's photo
    const asPhoto = await post(quality, '/api/ncrs', {
      serial: crank,
      description: 'A PDF posing as a photo of the crank',
      severity: 'minor',
      defectCode: 'DMG',
      photoIds: [pdf.body.id],
    });
    expect(asPhoto.status).toBe(400);
    expect(await Nonconformance.count({ where: { description: 'A PDF posing as a photo of the crank' } })).toBe(0);
    const evidence = await post(quality, `${url}/evidence`, { attachmentIds: [pdf.body.id, photo.body.id] });
    expect(evidence.status).toBe(201);
    expect(evidence.body.evidence.map((e: { mimeType: string }) => e.mimeType)).toEqual([
      'application/pdf',
      'image/png',
    ]);
    const download = await get(quality, pdf.body.url);
    expect(download.headers['content-disposition']).toMatch(/^attachment;/);

    const today = plantToday();
    const yesterday = new Date(Date.parse(`${today}T12:00:00Z`) - 86_400_000).toISOString().slice(0, 10);
    const backdated = await post(quality, `${url}/actions`, {
      kind: 'corrective',
      description: 'Add a dye check of the main webs',
      ownerId: owner.id,
      dueOn: yesterday,
    });
    expect(backdated.status).toBe(400);
    expect(backdated.body.error.fields.dueOn).toBe(`Not before ${today}.`);
    const added = await post(quality, `${url}/actions`, {
      kind: 'corrective',
      description: 'Add a dye check of the main webs at crack test',
      ownerId: owner.id,
      dueOn: today,
    });
    expect(added.status).toBe(201);
    await post(quality, `${url}/actions`, {
      kind: 'preventive',
      description: 'Ask the core buyer to grade porosity on arrival',
      ownerId: qualityUser.id,
      dueOn: today,
    });
    expect(
      await MailOutbox.count({
        where: { toAddress: owner.email, subject: `${ca.number}: an action for you, due ${today}` },
      }),
    ).toBe(1);
    const early = await post(quality, `${url}/close`, { reason: 'All done', password: TEST_PASSWORD });
    expect(early.status).toBe(409);
    expect(early.body.error.code).toBe('not_closable');
    expect(early.body.error.blockers).toEqual([
      'Record the root cause and its evidence.',
      '2 actions are still open.',
      'Set the day effectiveness is to be checked.',
    ]);

    const [first, second] = (await get(quality, url)).body.actions as CaJson['actions'];
    const stranger = await cookieFor(await makeUser('operator'), t.config);
    expect((await post(stranger, `${url}/actions/${first!.id}/done`, { note: 'Not mine' })).status).toBe(403);
    expect(
      (await post(ownerCookie, `${url}/actions/${first!.id}/done`, { note: 'Dye check in the crack-test form' }))
        .status,
    ).toBe(200);
    expect((await post(ownerCookie, `${url}/actions/${first!.id}/done`, { note: 'Again' })).status).toBe(409);
    expect(
      (await post(quality, `${url}/actions/${second!.id}/done`, { note: 'Grading note sent to buyer' })).status,
    ).toBe(200);

    expect(
      (await post(quality, `${url}/verify`, { effective: true, note: 'No returns since' })).body.error.reason,
    ).toBe('no_verification_day');
    await patch(quality, url, {
      rootCause: 'Casting porosity in the main web, not caught at crack test',
      verificationDueOn: tomorrowOf(today),
    });
    expect(
      (await post(quality, `${url}/verify`, { effective: true, note: 'No returns since' })).body.error.reason,
    ).toBe('too_early');
    await patch(quality, url, { verificationDueOn: today });
    const verified = await post(quality, `${url}/verify`, {
      effective: true,
      note: 'Thirty blocks dye-checked, two rejected',
    });
    expect(verified.status).toBe(200);
    expect(verified.body.closeBlockers).toEqual([]);

    const wrong = await post(quality, `${url}/close`, { reason: 'Effective', password: 'not mine' });
    expect(wrong.status).toBe(400);
    expect((await CorrectiveAction.findOne({ where: { number: ca.number } }))!.state).toBe('open');
    const closed = await post(quality, `${url}/close`, {
      reason: 'Effective: no porosity escapes since',
      password: TEST_PASSWORD,
    });
    expect(closed.status).toBe(200);
    expect(closed.body).toMatchObject({ state: 'closed', closedBy: 'CA Quality' });
    const sig = await Signature.findOne({ where: { entity: 'corrective_action', entityId: ca.number } });
    expect(sig).toMatchObject({ printedName: 'CA Quality', meaning: `Closed corrective action ${ca.number}` });
    const actions = (
      await AuditEvent.findAll({ where: { entity: 'corrective_action', entityId: ca.number }, order: [['id', 'ASC']] })
    ).map((e) => e.action);
    expect(actions).toEqual([
      'corrective_action.opened',
      'corrective_action.containment_linked',
      'corrective_action.containment_linked',
      'corrective_action.evidence_attached',
      'corrective_action.action_added',
      'corrective_action.action_added',
      'corrective_action.action_done',
      'corrective_action.action_done',
      'corrective_action.updated',
      'corrective_action.updated',
      'corrective_action.verified',
      'corrective_action.closed',
    ]);
    expect(closed.body.containmentLinks.map((c: { kind: string; number: string }) => [c.kind, c.number])).toEqual([
      ['hold', ncr],
      ['field_action', fa],
    ]);
    // closed is closed
    expect((await patch(quality, url, { problem: 'Rewritten afterwards' })).status).toBe(409);
    expect(
      (
        await post(quality, `${url}/actions`, {
          kind: 'corrective',
          description: 'One more thing',
          ownerId: owner.id,
          dueOn: today,
        })
      ).status,
    ).toBe(409);
  });
});

describe('closure raced against a new action', () => {
  it('when 40 closures race a new action on the same corrective action, then none closes over an open action', async () => {
    const today = plantToday();
    const ready: string[] = [];
    for (let i = 0; i < 40; i++) {
      const ca = await open();
      const url = `/api/corrective-actions/${ca.number}`;
      await patch(quality, url, { rootCause: 'Drill', verificationDueOn: today });
      const added = await post(quality, `${url}/actions`, {
        kind: 'corrective',
        description: 'Drill action',
        ownerId: owner.id,
        dueOn: today,
      });
      await post(quality, `${url}/actions/${added.body.actions[0].id}/done`, { note: 'Done' });
      await post(quality, `${url}/verify`, { effective: true, note: 'Drill check' });
      ready.push(ca.number);
    }
    let closedFirst = 0;
    let addedFirst = 0;
    for (const number of ready) {
      const offset = Math.round(Math.random() * 20 - 10);
      const at = async <T>(ms: number, fn: () => PromiseLike<T>) => {
        if (ms > 0) await sleep(ms);
        return fn();
      };
      const url = `/api/corrective-actions/${number}`;
      const [close, add] = await Promise.all([
        at(offset, () => post(quality, `${url}/close`, { reason: 'Drill closure', password: TEST_PASSWORD })),
        at(-offset, () =>
          post(quality, `${url}/actions`, {
            kind: 'preventive',
            description: 'Late action',
            ownerId: owner.id,
            dueOn: today,
          }),
        ),
      ]);
      // one of the two, never both and never neither
      expect([close.status < 300, add.status < 300].filter(Boolean), number).toHaveLength(1);
      expect(
        [close.status, add.status].filter((s) => s >= 300),
        number,
      ).toEqual([409]);
      // judged by commit order: every action of a closed record committed before its closure, and is done
      const [order] = await t.sequelize.query<{ open_before: number; after: number }>(
        `SELECT count(*) FILTER (WHERE t.done_at IS NULL)::int AS open_before,
                count(*) FILTER (WHERE pg_xact_commit_timestamp(t.xmin) > pg_xact_commit_timestamp(ca.xmin))::int AS after
           FROM corrective_actions ca JOIN corrective_action_tasks t ON t.corrective_action_id = ca.id
          WHERE ca.number = :number AND ca.state = 'closed'`,
        { type: QueryTypes.SELECT, replacements: { number } },
      );
      if (close.status === 200) {
        closedFirst += 1;
        expect(order).toEqual({ open_before: 0, after: 0 });
        expect(add.body.error.reason).toBe('closed');
      } else {
        addedFirst += 1;
        expect(close.body.error.blockers).toContain('1 action is still open.');
      }
    }
    console.log('closure race:', JSON.stringify({ closedFirst, addedFirst }));
    expect(closedFirst + addedFirst).toBe(40);
  }, 240_000);
});

describe('overdue actions', () => {
  it('when an action is past due, then its owner gets one reminder a day, however many processes look, and the homes list it', async () => {
    const ca = await open();
    const url = `/api/corrective-actions/${ca.number}`;
    const today = plantToday();
    await post(quality, `${url}/actions`, {
      kind: 'corrective',
      description: 'Re-train the crack-test crew',
      ownerId: owner.id,
      dueOn: today,
    });
    const day1 = tomorrowOf(today);
    const day2 = tomorrowOf(day1);
    // other API processes (their own pools, the same database), while this one keeps passing too
    const children = Promise.all([reminderPass(day1), reminderPass(day1)]);
    let finished = false;
    void children.finally(() => (finished = true));
    const here: number[] = [];
    while (!finished) {
      here.push(await sendOverdueReminders(t.sequelize, { today: day1 }));
      await sleep(15);
    }
    const total = [...(await children), ...here].reduce((a, n) => a + n, 0);
    // the passes between them queued this action's reminder once (other records may be due too)
    expect(total).toBeGreaterThanOrEqual(1);
    const mine = {
      toAddress: owner.email,
      reason: 'corrective_action.overdue',
      bodyText: { [Op.like]: `%${ca.number}%` },
    };
    expect(await MailOutbox.count({ where: mine })).toBe(1);
    await sendOverdueReminders(t.sequelize, { today: day2 });
    expect(await MailOutbox.count({ where: mine })).toBe(2);
    const [mail] = await MailOutbox.findAll({ where: mine, order: [['id', 'ASC']] });
    expect(mail!.subject).toBe(`Overdue since ${today}: your action in ${ca.number}`);
    // done, no more reminders
    const action = (await get(quality, url)).body.actions[0];
    await post(ownerCookie, `${url}/actions/${action.id}/done`, { note: 'Crew re-trained' });
    await sendOverdueReminders(t.sequelize, { today: tomorrowOf(day2) });
    expect(await MailOutbox.count({ where: mine })).toBe(2);
  });

  it('when an action is past due, then it is in its owner’s overdue list', async () => {
    const ca = await open();
    const url = `/api/corrective-actions/${ca.number}`;
    const added = await post(quality, `${url}/actions`, {
      kind: 'corrective',
      description: 'Update the control plan',
      ownerId: owner.id,
      dueOn: plantToday(),
    });
    const id = added.body.actions[0].id as number;
    // a fixture: the action was given a week ago
    await t.sequelize.query('UPDATE corrective_action_tasks SET due_on = due_on - 7 WHERE id = :id', {
      replacements: { id },
    });
    const list = await get(ownerCookie, '/api/corrective-actions/actions?owner=me&overdue=true&pageSize=200');
    expect(list.status).toBe(200);
    const row = list.body.rows.find((r: { id: number }) => r.id === id);
    expect(row).toMatchObject({ overdue: true, owner: { id: owner.id }, correctiveAction: { number: ca.number } });
    expect((await get(ownerCookie, '/api/corrective-actions/actions?owner=somebody')).status).toBe(400);
  });
});
