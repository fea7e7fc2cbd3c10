import { randomBytes } from 'node:crypto';
import pg from 'pg';
import request from 'supertest';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { recordAudit, verifyAuditChain, hashEvent, GENESIS_HASH } from '../../server/audit.js';
import { createSequelize } from '../../server/db.js';
import { migrate } from '../../server/migrate.js';
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

  it('when anyone tries to UPDATE, DELETE or TRUNCATE audit_events, then the database refuses', async () => {
    for (const sql of [
      "UPDATE audit_events SET action = 'changed' WHERE id = (SELECT min(id) FROM audit_events)",
      'DELETE FROM audit_events WHERE id = (SELECT min(id) FROM audit_events)',
      'TRUNCATE audit_events',
    ]) {
      await expect(t.sequelize.query(sql)).rejects.toThrow(/append-only/);
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

describe('the hash chain', () => {
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

    it('when a row is altered, its id is reported; when a row is removed, the next one is', async () => {
      const ctx = { actor: null, requestId: 'tamper' };
      for (let i = 1; i <= 5; i++) {
        await own.transaction((transaction) =>
          recordAudit(ctx, transaction, {
            action: 'test.event',
            entity: 'test',
            entityId: i,
            after: { n: i, note: 'ünïcode ✓' },
          }),
        );
      }
      expect(await verifyAuditChain(own)).toEqual({ ok: true, checked: 5, firstBroken: null });
      const ids = (
        await own.query<{ id: number }>('SELECT id FROM audit_events ORDER BY id', { type: QueryTypes.SELECT })
      ).map((r) => r.id);

      await own.query('ALTER TABLE audit_events DISABLE TRIGGER audit_events_no_update_delete');
      await own.query(`UPDATE audit_events SET after = '{"n": 99}' WHERE id = ${ids[2]}`);
      await own.query('ALTER TABLE audit_events ENABLE TRIGGER audit_events_no_update_delete');
      let report = await verifyAuditChain(own);
      expect(report.ok).toBe(false);
      expect(report.firstBroken).toEqual({ id: ids[2], reason: 'its content does not match its hash' });
      expect(report.checked).toBe(2);

      await own.query('ALTER TABLE audit_events DISABLE TRIGGER audit_events_no_update_delete');
      await own.query(`DELETE FROM audit_events WHERE id IN (${ids[2]})`);
      await own.query('ALTER TABLE audit_events ENABLE TRIGGER audit_events_no_update_delete');
      report = await verifyAuditChain(own);
      expect(report.firstBroken).toEqual({ id: ids[3], reason: 'does not link to the event before it' });
    });
  });
});
