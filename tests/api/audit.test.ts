import { randomBytes } from 'node:crypto';
import pg from 'pg';
import request from 'supertest';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { recordAudit, hashEvent, GENESIS_HASH } from '../../server/audit.js';
import { integrateAll } from '../../server/ledger/sequencer.js';
import { signerFromPem } from '../../server/ledger/signer.js';
import { verifyAudit } from '../../server/ledger/verify.js';
import { TEST_PLANT_KEY } from '../support/ledger.js';
import { createSequelize } from '../../server/db.js';
import { migrate, migrator } from '../../server/migrate.js';
import { AuditEvent } from '../../server/models/index.js';
import { cookieFor, makeTestApp, makeUser, unique, type TestApp } from '../support/app.js';

let t: TestApp;
beforeAll(() => {
  t = makeTestApp();
});
afterAll(() => t.close());

describe('audit events are written with the change', () => {
  it('when an admin creates and edits a person, then events carry actor, role, before/after and request id', async () => {
    const admin = await makeUser('admin');
    const cookie = await cookieFor(admin, t.config);
    const email = `${unique('a')}@test.example`;
    const created = await request(t.app)
      .post('/api/people')
      .set('Cookie', cookie)
      .set('X-Request-Id', 'req-audit-create-1')
      .send({ email, name: 'Audit Subject', role: 'operator', password: 'long enough pass' });
    expect(created.status).toBe(201);
    await request(t.app).patch(`/api/people/${created.body.id}`).set('Cookie', cookie).send({ role: 'supervisor' });

    const events = await AuditEvent.findAll({
      where: { entity: 'user', entityId: String(created.body.id) },
      order: [['id', 'ASC']],
    });
    expect(events.map((e) => e.action)).toEqual(['user.created', 'user.updated']);
    const [c, u] = events;
    expect(c!.actorId).toBe(admin.id);
    expect(c!.actorRole).toBe('admin');
    expect(c!.requestId).toBe('req-audit-create-1');
    expect(c!.before).toBeNull();
    expect(c!.after).toMatchObject({ email, role: 'operator' });
    expect(JSON.stringify(c!.after)).not.toMatch(/\$2[aby]\$/); // never the password hash
    expect(u!.before).toMatchObject({ role: 'operator' });
    expect(u!.after).toMatchObject({ role: 'supervisor' });
    expect(c!.occurredAt.getTime()).toBeLessThanOrEqual(u!.occurredAt.getTime());
  });

  it('when the change fails, then its audit event is rolled back with it', async () => {
    const ctx = { actor: null, requestId: 'rollback-test' };
    const entityId = unique('rb');
    await expect(
      t.sequelize.transaction(async (transaction) => {
        await recordAudit(ctx, transaction, { action: 'test.rollback', entity: 'test', entityId });
        throw new Error('the change itself failed');
      }),
    ).rejects.toThrow('the change itself failed');
    expect(await AuditEvent.count({ where: { entityId } })).toBe(0);
  });

  /** Runs `sql` with a short lock wait, again while it only timed out waiting for its lock. */
  async function refused(sql: string): Promise<void> {
    for (let attempt = 0; ; attempt++) {
      try {
        await t.sequelize.transaction(async (transaction) => {
          await t.sequelize.query("SET LOCAL lock_timeout = '1s'", { transaction });
          await t.sequelize.query(sql, { transaction });
        });
        return;
      } catch (err) {
        if (attempt < 30 && /lock timeout/i.test(String((err as Error).message))) continue;
        throw err;
      }
    }
  }

  it('when anyone tries to UPDATE, DELETE or TRUNCATE audit_events or the stored log, then the database refuses', async () => {
    for (const sql of [
      'UPDATE audit_leaves SET leaf_hash = leaf_hash WHERE leaf_index = 0',
      'DELETE FROM audit_tree_nodes WHERE level = 1',
      'TRUNCATE audit_log_heads',
      'DELETE FROM audit_log_state',
      "UPDATE audit_events SET action = 'changed' WHERE id = (SELECT min(id) FROM audit_events)",
      'DELETE FROM audit_events WHERE id = (SELECT min(id) FROM audit_events)',
      'TRUNCATE audit_events',
    ]) {
      // TRUNCATE audit_events now stops earlier, at the log's foreign key to it. A TRUNCATE waits for
      // an exclusive lock, and every other file's audited write would queue behind it: each try
      // gives up the lock request after a second, and is tried again until the database answers
      await expect(refused(sql)).rejects.toThrow(/append-only|referenced in a foreign key/);
    }
  });

  it('GET /api/audit/events lists newest first with the actor name', async () => {
    const admin = await makeUser('admin', { name: 'Listing Admin' });
    const cookie = await cookieFor(admin, t.config);
    await request(t.app)
      .post('/api/auth/logout')
      .set('Cookie', await cookieFor(admin, t.config));
    const res = await request(t.app).get(`/api/audit/events?entity=user&entityId=${admin.id}`).set('Cookie', cookie);
    expect(res.status).toBe(200);
    expect(res.body.rows[0]).toMatchObject({
      action: 'user.signed_out',
      actorName: 'Listing Admin',
      actorRole: 'admin',
    });
    expect(res.body.total).toBe(1);
  });
});

describe('the hash chain of the events before the log, and tampering', () => {
  it('hashes the previous hash with the canonical JSON of the event (RFC 8785 key order)', () => {
    const e = {
      occurredAt: '2026-12-01T00:00:00.000Z',
      actorId: 1,
      actorRole: 'admin',
      action: 'x',
      entity: 'y',
      entityId: '1',
      before: null,
      after: { b: 1, a: 2 },
      requestId: null,
    };
    const reordered = { ...e, after: { a: 2, b: 1 } };
    expect(hashEvent(GENESIS_HASH, e)).toBe(hashEvent(GENESIS_HASH, reordered));
    expect(hashEvent(GENESIS_HASH, e)).not.toBe(hashEvent(GENESIS_HASH, { ...e, entityId: '2' }));
    expect(hashEvent(GENESIS_HASH, e)).toMatch(/^[0-9a-f]{64}$/);
  });

  // Tampering needs the trigger disabled, so it runs in a database of its own and cannot disturb
  // the suites sharing the test database.
  describe('tampering in SQL is detected', () => {
    const name = `coretrail_tamper_${randomBytes(4).toString('hex')}`;
    const admin = new pg.Client({ connectionString: process.env.ADMIN_DATABASE_URL });
    let own: ReturnType<typeof createSequelize>;

    beforeAll(async () => {
      await admin.connect();
      await admin.query(`CREATE DATABASE ${name}`);
      const url = new URL(process.env.DATABASE_URL!);
      url.pathname = `/${name}`;
      own = createSequelize(url.toString(), { poolMax: 3 });
      await migrate(own);
    });
    afterAll(async () => {
      // the models stay bound to this closed instance: keep this block last in the file
      await own.close();
      await admin.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
      await admin.end();
    });

    it('when events from before the log are migrated, then their chain still verifies and they are the first leaves, in chain order', async () => {
      // a database at the migration before the log, with chained events written the old way
      const name2 = `${name}_legacy`;
      await admin.query(`CREATE DATABASE ${name2}`);
      const url = new URL(process.env.DATABASE_URL!);
      url.pathname = `/${name2}`;
      const legacy = createSequelize(url.toString(), { poolMax: 2 });
      try {
        await migrator(legacy).up({ to: '20261202150000-reference-version' });
        let prev = GENESIS_HASH;
        for (let i = 1; i <= 4; i++) {
          const e = {
            occurredAt: new Date(Date.UTC(2026, 11, 1, 8, i)).toISOString(),
            actorId: null,
            actorRole: null,
            action: 'test.legacy',
            entity: 'test',
            entityId: String(i),
            before: null,
            after: { n: i },
            requestId: null,
          };
          const hash = hashEvent(prev, e);
          await legacy.query(
            `INSERT INTO audit_events (occurred_at, action, entity, entity_id, after, prev_hash, hash)
           VALUES ($1, $2, $3, $4, $5, $6, $7)`,
            { bind: [e.occurredAt, e.action, e.entity, e.entityId, JSON.stringify(e.after), prev, hash] },
          );
          prev = hash;
        }
        await migrate(legacy);
        await legacy.transaction((transaction) =>
          recordAudit({ actor: null, requestId: 'after' }, transaction, {
            action: 'test.new',
            entity: 'test',
            entityId: 5,
          }),
        );
        await integrateAll(legacy, { signer: signerFromPem(TEST_PLANT_KEY) });
        const order = await legacy.query<{ action: string; entity_id: string; hash: string | null }>(
          `SELECT e.action, e.entity_id, e.hash FROM audit_leaves l JOIN audit_events e ON e.id = l.event_id
          ORDER BY l.leaf_index`,
          { type: QueryTypes.SELECT },
        );
        expect(order.map((o) => o.entity_id)).toEqual(['1', '2', '3', '4', '5']);
        expect(order.map((o) => o.hash === null)).toEqual([false, false, false, false, true]);
        const report = await verifyAudit(legacy, { signer: signerFromPem(TEST_PLANT_KEY) });
        expect(report).toMatchObject({ ok: true, checked: 5, chain: { checked: 4 }, firstBroken: null });
        // a chained event altered in SQL still breaks its link, and its leaf
        await legacy.query('ALTER TABLE audit_events DISABLE TRIGGER audit_events_no_update_delete');
        await legacy.query(`UPDATE audit_events SET after = '{"n": 99}' WHERE entity_id = '2'`);
        await legacy.query('ALTER TABLE audit_events ENABLE TRIGGER audit_events_no_update_delete');
        const broken = await verifyAudit(legacy);
        expect(broken.ok).toBe(false);
        expect(broken.firstBroken?.reason).toBe('its content does not match its hash');
      } finally {
        await legacy.close();
        await admin.query(`DROP DATABASE IF EXISTS ${name2} WITH (FORCE)`);
      }
    });

    it('when an event, a leaf or the end of the log is changed in SQL, then verify names what no longer holds', async () => {
      const ctx = { actor: null, requestId: 'tamper' };
      const signer = signerFromPem(TEST_PLANT_KEY);
      for (let i = 1; i <= 6; i++) {
        await own.transaction((transaction) =>
          recordAudit(ctx, transaction, {
            action: 'test.event',
            entity: 'test',
            entityId: i,
            after: { n: i, note: 'ünïcode ✓' },
          }),
        );
      }
      await integrateAll(own, { signer, forceHead: true });
      expect(await verifyAudit(own, { signer })).toMatchObject({ ok: true, checked: 6, firstBroken: null });
      const ids = (
        await own.query<{ id: number }>('SELECT id FROM audit_events ORDER BY id', { type: QueryTypes.SELECT })
      ).map((r) => Number(r.id));

      // an event's content: named by id
      await own.query('ALTER TABLE audit_events DISABLE TRIGGER audit_events_no_update_delete');
      await own.query(`UPDATE audit_events SET after = '{"n": 99}' WHERE id = ${ids[2]}`);
      await own.query('ALTER TABLE audit_events ENABLE TRIGGER audit_events_no_update_delete');
      let report = await verifyAudit(own, { signer });
      expect(report.ok).toBe(false);
      expect(report.firstBroken).toEqual({ id: ids[2], reason: 'its content does not match its leaf in the log' });
      await own.query('ALTER TABLE audit_events DISABLE TRIGGER audit_events_no_update_delete');
      await own.query(`UPDATE audit_events SET after = '{"n": 3, "note": "ünïcode ✓"}' WHERE id = ${ids[2]}`);
      await own.query('ALTER TABLE audit_events ENABLE TRIGGER audit_events_no_update_delete');
      expect((await verifyAudit(own, { signer })).ok).toBe(true);

      // a leaf rewritten: it no longer matches its event, and the signed head's root no longer comes out
      await own.query('ALTER TABLE audit_leaves DISABLE TRIGGER audit_leaves_no_update_delete');
      const [kept] = await own.query<{ h: string }>(
        `SELECT encode(leaf_hash, 'hex') AS h FROM audit_leaves WHERE leaf_index = 1`,
        {
          type: QueryTypes.SELECT,
        },
      );
      await own.query(`UPDATE audit_leaves SET leaf_hash = sha256('forged') WHERE leaf_index = 1`);
      report = await verifyAudit(own, { signer });
      expect(report.ok).toBe(false);
      expect(report.firstBroken).toEqual({ id: ids[1], reason: 'its content does not match its leaf in the log' });
      await own.query(`UPDATE audit_leaves SET leaf_hash = decode('${kept!.h}', 'hex') WHERE leaf_index = 1`);
      await own.query('ALTER TABLE audit_leaves ENABLE TRIGGER audit_leaves_no_update_delete');
      expect((await verifyAudit(own, { signer })).ok).toBe(true);

      // the newest event and its leaf removed (what the old chain could not see): the signed head is larger
      await own.query('ALTER TABLE audit_leaves DISABLE TRIGGER audit_leaves_no_update_delete');
      await own.query(`DELETE FROM audit_leaves WHERE leaf_index = 5`);
      await own.query('ALTER TABLE audit_leaves ENABLE TRIGGER audit_leaves_no_update_delete');
      await own.query('ALTER TABLE audit_events DISABLE TRIGGER audit_events_no_update_delete');
      await own.query(`DELETE FROM audit_events WHERE id = ${ids[5]}`);
      await own.query('ALTER TABLE audit_events ENABLE TRIGGER audit_events_no_update_delete');
      report = await verifyAudit(own, { signer });
      expect(report.ok).toBe(false);
      expect(report.firstBroken).toEqual({
        id: null,
        reason: 'a head was signed at size 6 but the log holds 5 entries',
      });
    });

    it('when a queued event is dropped from the queue, then verify reports it as missing from the log', async () => {
      const id = await own.transaction(async (transaction) => {
        await recordAudit({ actor: null, requestId: 'hidden' }, transaction, {
          action: 'test.hidden',
          entity: 'test',
          entityId: 99,
        });
        const [r] = await own.query<{ id: number }>('SELECT max(id) AS id FROM audit_events', {
          type: QueryTypes.SELECT,
          transaction,
        });
        return Number(r!.id);
      });
      await own.query(`DELETE FROM audit_pending WHERE event_id = ${id}`);
      const report = await verifyAudit(own);
      expect(report.ok).toBe(false);
      expect(JSON.stringify(report)).toContain('neither in the log nor waiting');
    });
  });
});
