import { setTimeout as sleep } from 'node:timers/promises';
import request from 'supertest';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CharacteristicVersion, ProcessImport, Signature } from '../../server/models/index.js';
import { TEST_PASSWORD, cookieFor, makeUser, unique, type TestApp } from '../support/app.js';
import { expectCommitTimestamps, ownDatabase } from '../support/own-database.js';
import { ownCharacteristic } from '../support/characteristics.js';

/**
 * The process definition's "one draft at a time" rules under races: a characteristic has at most
 * one drafted change, the plant at most one draft import, and a draft is decided once. Each pair
 * fires its two requests at a random offset of up to one request's time either way (timed first),
 * so both orders happen; where the outcome depends on which committed first, PostgreSQL's own
 * commit timestamps (track_commit_timestamp) judge it. In a database of its own, as the other race
 * drills are: the plant-wide draft import of this file must not meet the import tests' drafts.
 */
const PAIRS = 30;
const IMPORT_PAIRS = 20;

let t: TestApp;
let drop: (() => Promise<void>) | undefined;
let author: string;
let second: string;
let approvers: [string, string];

beforeAll(async () => {
  ({ t, drop } = await ownDatabase('process_draft_race'));
  await expectCommitTimestamps(t);
  author = await cookieFor(await makeUser('quality', { quickSignature: true }), t.config);
  second = await cookieFor(await makeUser('admin', { quickSignature: true }), t.config);
  approvers = [
    await cookieFor(await makeUser('quality', { quickSignature: true, name: 'Race Approver One' }), t.config),
    await cookieFor(await makeUser('quality', { quickSignature: true, name: 'Race Approver Two' }), t.config),
  ];
}, 300_000);
afterAll(() => drop?.());

async function after<T>(ms: number, fn: () => PromiseLike<T>): Promise<T> {
  if (ms > 0) await sleep(ms);
  return fn();
}

/**
 * A random offset from `span` ms one way to `later` spans the other: positive delays the second
 * request, negative the first. A discard is quicker than the draft it races, and the draft reads
 * the waiting draft early in its work, so the discard-first side gets the wider share.
 */
const offsetWithin = (span: number, later = 1) => Math.round((Math.random() * (1 + later) - 1) * span);

/** How long one call takes, warm: the offsets are drawn within it, so both orders happen. */
async function timed(fn: () => PromiseLike<{ status: number }>, status: number) {
  const started = performance.now();
  const res = await fn();
  expect(res.status).toBe(status);
  return Math.max(4, performance.now() - started);
}

const newCharacteristic = async () => (await ownCharacteristic(t, author, 'race', 'Deck check of the race drill')).id;

const draftChange = (cookie: string, id: number, note: string) =>
  request(t.app)
    .post(`/api/process/characteristics/${id}/versions`)
    .set('Cookie', cookie)
    .send({ note, help: `Measured at four corners (${note})` });

/** Commit time of the transaction that last wrote a row, compared: was `first`'s before `then`'s? */
async function committedBefore(first: { table: string; id: number }, then: { table: string; id: number }) {
  const [row] = await t.sequelize.query<{ before: boolean }>(
    `SELECT pg_xact_commit_timestamp(a.xmin) < pg_xact_commit_timestamp(b.xmin) AS before
       FROM ${first.table} a, ${then.table} b WHERE a.id = :a AND b.id = :b`,
    { type: QueryTypes.SELECT, replacements: { a: first.id, b: then.id } },
  );
  return row!.before;
}

describe('a characteristic has one drafted change at a time, raced', () => {
  it(`when two people race to draft a change to one characteristic ${PAIRS} times, then each time exactly one draft is kept and the other is told which`, async () => {
    const warm = await newCharacteristic();
    const span = await timed(() => draftChange(author, warm, 'warm-up'), 201);
    const wrong: string[] = [];
    for (let n = 0; n < PAIRS; n++) {
      const id = await newCharacteristic();
      const offset = offsetWithin(span);
      const replies = await Promise.all([
        after(-offset, () => draftChange(author, id, `pair ${n} first`)),
        after(offset, () => draftChange(second, id, `pair ${n} second`)),
      ]);
      const kept = replies.filter((r) => r.status === 201);
      const refused = replies.filter((r) => r.status !== 201);
      if (kept.length !== 1) {
        wrong.push(`pair ${n}: ${replies.map((r) => `${r.status} ${JSON.stringify(r.body)}`).join(' / ')}`);
        continue;
      }
      expect(refused[0]!.status, JSON.stringify(refused[0]!.body)).toBe(409);
      expect(refused[0]!.body.error.message).toBe(
        'Version 2 of Deck height is already a draft: approve or discard it first.',
      );
      const drafts = await CharacteristicVersion.findAll({ where: { characteristicId: id, status: 'draft' } });
      expect(drafts.map((d) => d.id)).toEqual([kept[0]!.body.id]);
      // the version before the first change is written once, whoever drafted first
      expect(await CharacteristicVersion.count({ where: { characteristicId: id } })).toBe(2);
    }
    expect(wrong).toEqual([]);
  }, 300_000);

  it(`when a new draft races the discard of the draft before it ${PAIRS} times, then a new draft is kept only when the discard committed first`, async () => {
    const warm = await newCharacteristic();
    const span = await timed(() => draftChange(author, warm, 'warm-up'), 201);
    const tally = { kept: 0, refused: 0, wrong: [] as string[] };
    for (let n = 0; n < PAIRS; n++) {
      const id = await newCharacteristic();
      const old = await draftChange(author, id, `pair ${n} old`);
      expect(old.status).toBe(201);
      const offset = offsetWithin(span, 2);
      const [discarded, drafted] = await Promise.all([
        after(-offset, () =>
          request(t.app).post(`/api/process/characteristic-versions/${old.body.id}/discard`).set('Cookie', author),
        ),
        after(offset, () => draftChange(second, id, `pair ${n} new`)),
      ]);
      expect(discarded.status, JSON.stringify(discarded.body)).toBe(200);
      if (drafted.status === 201) {
        tally.kept += 1;
        expect(drafted.body.version).toBe(3);
        // the discard updated the old version's row: its commit came before the new row's
        const first = await committedBefore(
          { table: 'characteristic_versions', id: old.body.id },
          { table: 'characteristic_versions', id: drafted.body.id },
        );
        if (!first) tally.wrong.push(`pair ${n}: version 3 was kept before version 2's discard committed`);
      } else {
        expect(drafted.status, JSON.stringify(drafted.body)).toBe(409);
        // refused for the draft the race was about, and for nothing else
        expect(drafted.body.error.message).toBe(
          'Version 2 of Deck height is already a draft: approve or discard it first.',
        );
        tally.refused += 1;
      }
      expect(await CharacteristicVersion.count({ where: { characteristicId: id, status: 'draft' } })).toBe(
        drafted.status === 201 ? 1 : 0,
      );
    }
    console.log('discard-vs-draft race:', JSON.stringify({ kept: tally.kept, refused: tally.refused, span }));
    expect(tally.wrong).toEqual([]);
    expect(tally.kept + tally.refused).toBe(PAIRS);
    // both orders happened, so the drill raced for real
    expect(tally.kept).toBeGreaterThan(0);
    expect(tally.refused).toBeGreaterThan(0);
  }, 300_000);

  it(`when two approvers and a discard race over one draft ${PAIRS} times, then exactly one decision stands, signed once if it is an approval`, async () => {
    const wrong: string[] = [];
    const wins = { approved: 0, discarded: 0 };
    for (let n = 0; n < PAIRS; n++) {
      const id = await newCharacteristic();
      const d = await draftChange(author, id, `pair ${n}`);
      expect(d.status).toBe(201);
      const approve = (cookie: string) =>
        request(t.app)
          .post(`/api/process/characteristic-versions/${d.body.id}/approve`)
          .set('Cookie', cookie)
          .send({ reason: `Race drill pair ${n}`, password: TEST_PASSWORD });
      const replies = await Promise.all([
        after(Math.round(Math.random() * 15), () => approve(approvers[0])),
        after(Math.round(Math.random() * 15), () => approve(approvers[1])),
        after(Math.round(Math.random() * 15), () =>
          request(t.app).post(`/api/process/characteristic-versions/${d.body.id}/discard`).set('Cookie', author),
        ),
      ]);
      const ok = replies.filter((r) => r.status === 200);
      if (ok.length !== 1 || replies.some((r) => r.status !== 200 && r.status !== 409)) {
        wrong.push(`pair ${n}: ${replies.map((r) => r.status).join(', ')}`);
        continue;
      }
      const row = (await CharacteristicVersion.findByPk(d.body.id))!;
      expect(row.status).toBe(ok[0]!.body.status);
      wins[row.status as 'approved' | 'discarded'] += 1;
      const signatures = await Signature.count({
        where: { entity: 'characteristic_version', entityId: String(d.body.id) },
      });
      expect(signatures).toBe(row.status === 'approved' ? 1 : 0);
      const [{ decisions }] = (await t.sequelize.query<{ decisions: number }>(
        `SELECT count(*)::int AS decisions FROM audit_events
          WHERE entity = 'characteristic' AND entity_id = :id
            AND action IN ('characteristic.change_approved', 'characteristic.change_discarded')`,
        { type: QueryTypes.SELECT, replacements: { id: String(id) } },
      )) as [{ decisions: number }];
      expect(decisions).toBe(1);
    }
    console.log('decision race:', JSON.stringify(wins));
    expect(wrong).toEqual([]);
  }, 300_000);
});

/** A document of the pair's own: one part kind and one stage it adds, nothing more. */
function document() {
  const tag = unique('').slice(0, 6);
  return {
    format: 'coretrail-process',
    version: 1,
    partKinds: [{ code: `race_${tag}`, name: `Race drill part ${tag}`, serialized: false }],
    families: [],
    stages: [{ code: `race-wash-${tag}`, partKind: `race_${tag}`, name: 'Race drill wash' }],
    characteristics: [],
    routes: [],
    castingNumbers: [],
  };
}

const draftImport = (cookie: string, note: string) =>
  request(t.app).post('/api/process/imports').query({ note }).set('Cookie', cookie).send(document());

const discardImport = (id: number) => request(t.app).post(`/api/process/imports/${id}/discard`).set('Cookie', author);

describe('the plant has one draft import at a time, raced', () => {
  it(`when two documents race to be the draft import ${IMPORT_PAIRS} times, then each time exactly one is kept and the other is told which`, async () => {
    const warm = await draftImport(author, 'warm-up');
    expect(warm.status, JSON.stringify(warm.body)).toBe(201);
    const span = await timed(() => discardImport(warm.body.id), 200);
    const wrong: string[] = [];
    for (let n = 0; n < IMPORT_PAIRS; n++) {
      const offset = offsetWithin(span);
      const replies = await Promise.all([
        after(-offset, () => draftImport(author, `pair ${n} first`)),
        after(offset, () => draftImport(second, `pair ${n} second`)),
      ]);
      const kept = replies.filter((r) => r.status === 201);
      const refused = replies.filter((r) => r.status !== 201);
      if (kept.length !== 1) {
        wrong.push(`pair ${n}: ${replies.map((r) => `${r.status} ${JSON.stringify(r.body)}`).join(' / ')}`);
        // leave no draft behind for the next pair
        await ProcessImport.update({ status: 'discarded' }, { where: { status: 'draft' } });
        continue;
      }
      expect(refused[0]!.status, JSON.stringify(refused[0]!.body)).toBe(409);
      expect(refused[0]!.body.error.message).toBe(
        `Import ${kept[0]!.body.id} is already a draft: approve or discard it first.`,
      );
      expect((await ProcessImport.findAll({ where: { status: 'draft' } })).map((i) => i.id)).toEqual([
        kept[0]!.body.id,
      ]);
      expect((await discardImport(kept[0]!.body.id)).status).toBe(200);
    }
    expect(wrong).toEqual([]);
  }, 300_000);

  it(`when a new document races the discard of the draft import before it ${IMPORT_PAIRS} times, then it is kept only when the discard committed first`, async () => {
    const warm = await draftImport(author, 'warm-up');
    expect(warm.status, JSON.stringify(warm.body)).toBe(201);
    const span = await timed(() => discardImport(warm.body.id), 200);
    const tally = { kept: 0, refused: 0, wrong: [] as string[] };
    for (let n = 0; n < IMPORT_PAIRS; n++) {
      const old = await draftImport(author, `pair ${n} old`);
      expect(old.status, JSON.stringify(old.body)).toBe(201);
      // timed by a discard, which is the slower of the two here (it settles no plan)
      const offset = offsetWithin(span);
      const [discarded, drafted] = await Promise.all([
        after(-offset, () => discardImport(old.body.id)),
        after(offset, () => draftImport(second, `pair ${n} new`)),
      ]);
      expect(discarded.status, JSON.stringify(discarded.body)).toBe(200);
      if (drafted.status === 201) {
        tally.kept += 1;
        const first = await committedBefore(
          { table: 'process_imports', id: old.body.id },
          { table: 'process_imports', id: drafted.body.id },
        );
        if (!first) tally.wrong.push(`pair ${n}: import ${drafted.body.id} was kept before ${old.body.id}'s discard`);
        expect((await discardImport(drafted.body.id)).status).toBe(200);
      } else {
        expect(drafted.status, JSON.stringify(drafted.body)).toBe(409);
        expect(drafted.body.error.message).toBe(
          `Import ${old.body.id} is already a draft: approve or discard it first.`,
        );
        tally.refused += 1;
      }
      expect(await ProcessImport.count({ where: { status: 'draft' } })).toBe(0);
    }
    console.log('discard-vs-import race:', JSON.stringify({ kept: tally.kept, refused: tally.refused, span }));
    expect(tally.wrong).toEqual([]);
    expect(tally.kept + tally.refused).toBe(IMPORT_PAIRS);
    expect(tally.kept).toBeGreaterThan(0);
    expect(tally.refused).toBeGreaterThan(0);
  }, 300_000);

  it(`when two approvers and a discard race over one draft import ${IMPORT_PAIRS} times, then exactly one decision stands and the document is applied at most once`, async () => {
    const wrong: string[] = [];
    const wins = { approved: 0, discarded: 0 };
    for (let n = 0; n < IMPORT_PAIRS; n++) {
      const doc = document();
      const d = await request(t.app).post('/api/process/imports').set('Cookie', author).send(doc);
      expect(d.status, JSON.stringify(d.body)).toBe(201);
      const approve = (cookie: string) =>
        request(t.app)
          .post(`/api/process/imports/${d.body.id}/approve`)
          .set('Cookie', cookie)
          .send({ reason: `Race drill pair ${n}`, password: TEST_PASSWORD });
      const replies = await Promise.all([
        after(Math.round(Math.random() * 15), () => approve(approvers[0])),
        after(Math.round(Math.random() * 15), () => approve(approvers[1])),
        after(Math.round(Math.random() * 15), () => discardImport(d.body.id)),
      ]);
      const ok = replies.filter((r) => r.status === 200);
      if (ok.length !== 1 || replies.some((r) => r.status !== 200 && r.status !== 409)) {
        wrong.push(`pair ${n}: ${replies.map((r) => `${r.status} ${JSON.stringify(r.body)}`).join(' / ')}`);
        await ProcessImport.update({ status: 'discarded' }, { where: { status: 'draft' } });
        continue;
      }
      const row = (await ProcessImport.findByPk(d.body.id))!;
      expect(row.status).toBe(ok[0]!.body.status);
      wins[row.status as 'approved' | 'discarded'] += 1;
      expect(await Signature.count({ where: { entity: 'process_import', entityId: String(d.body.id) } })).toBe(
        row.status === 'approved' ? 1 : 0,
      );
      const [{ kinds }] = (await t.sequelize.query<{ kinds: number }>(
        'SELECT count(*)::int AS kinds FROM part_kinds WHERE code = :code',
        { type: QueryTypes.SELECT, replacements: { code: doc.partKinds[0]!.code } },
      )) as [{ kinds: number }];
      expect(kinds).toBe(row.status === 'approved' ? 1 : 0);
    }
    console.log('import decision race:', JSON.stringify(wins));
    expect(wrong).toEqual([]);
  }, 300_000);
});
