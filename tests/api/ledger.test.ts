import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { checkHead, type SignedHead } from '../../shared/ledger/head.js';
import { fromHex, rfc6962, verifyConsistency, verifyInclusion } from '../../shared/ledger/merkle.js';
import { entryLeafHash } from '../../shared/ledger/entry.js';
import { recordAudit, systemCtx } from '../../server/audit.js';
import { createSequelize } from '../../server/db.js';
import { receiptFor } from '../../server/ledger/receipts.js';
import { integrateAll, integratePass } from '../../server/ledger/sequencer.js';
import { signerFromPem } from '../../server/ledger/signer.js';
import { verifyAudit } from '../../server/ledger/verify.js';
import { cookieFor, makeTestApp, makeUser, unique, type TestApp } from '../support/app.js';
import { sleep, TEST_PLANT_KEY } from '../support/ledger.js';

// The sequencer over the shared test database: other files write audit events at the same time,
// so each check here looks at its own events (marked by entity and a run id) and never at counts.

const pem = TEST_PLANT_KEY;
const signer = signerFromPem(pem);
const opts = { signer, headIntervalMs: 0 };
let t: TestApp;

beforeAll(() => {
  // more connections than the default five: the drill holds many transactions open at once
  const sequelize = createSequelize(process.env.DATABASE_URL!, { poolMax: 24 });
  t = makeTestApp({ AUDIT_SIGNING_KEY: pem }, sequelize);
});
afterAll(() => t.sequelize.close());

type Placed = { id: number; entity_id: string; leaf_index: number | null };
const placed = (entity: string) =>
  t.sequelize.query<Placed>(
    `SELECT e.id, e.entity_id, l.leaf_index FROM audit_events e LEFT JOIN audit_leaves l ON l.event_id = e.id
      WHERE e.entity = $1 ORDER BY e.id`,
    { type: QueryTypes.SELECT, bind: [entity] },
  );

describe('the sequencer integrates committed events, and only those, without a lock on the write path', () => {
  it('when many audited writes race, some roll back and one commits late, then the log holds every committed one exactly once and every proof verifies', async () => {
    const entity = unique('drill');
    const ctx = systemCtx('ledger-drill');
    const committed = new Set<string>();
    const rolledBack = new Set<string>();

    // a transaction that writes its event first and commits last
    let releaseLate!: () => void;
    const lateGate = new Promise<void>((r) => (releaseLate = r));
    let lateWritten!: () => void;
    const lateReady = new Promise<void>((r) => (lateWritten = r));
    const late = t.sequelize.transaction(async (transaction) => {
      await recordAudit(ctx, transaction, { action: 'drill.late', entity, entityId: 'late', after: { n: -1 } });
      lateWritten();
      await lateGate;
    });
    await lateReady;

    // 3 rounds × 30 writers with random offsets; about one in four rolls back, some hold their commit
    for (let round = 0; round < 3; round++) {
      await Promise.all(
        Array.from({ length: 30 }, async (_, i) => {
          const id = `r${round}-${i}`;
          const fail = Math.random() < 0.25;
          await sleep(Math.random() * 40);
          try {
            await t.sequelize.transaction(async (transaction) => {
              await recordAudit(ctx, transaction, { action: 'drill.write', entity, entityId: id, after: { n: i } });
              if (Math.random() < 0.3) await sleep(Math.random() * 60);
              if (fail) throw new Error('rolled back on purpose');
            });
            committed.add(id);
          } catch {
            rolledBack.add(id);
          }
        }),
      );
      // a pass between rounds, while the late transaction is still open
      await integrateAll(t.sequelize, opts);
    }
    let rows = await placed(entity);
    // everything committed so far is placed; the late event is not visible, so not placed
    expect(rows.filter((r) => r.leaf_index === null)).toEqual([]);
    expect(rows.map((r) => r.entity_id)).not.toContain('late');
    const before = Math.max(...rows.map((r) => Number(r.leaf_index)));

    releaseLate();
    await late;
    committed.add('late');
    await integrateAll(t.sequelize, opts);
    rows = await placed(entity);

    // every committed event exactly once, no rolled-back one
    expect(rows.map((r) => r.entity_id).sort()).toEqual([...committed].sort());
    for (const id of rolledBack) expect(rows.map((r) => r.entity_id)).not.toContain(id);
    expect(new Set(rows.map((r) => r.leaf_index)).size).toBe(rows.length);
    expect(rows.every((r) => r.leaf_index !== null)).toBe(true);
    // the late one was not skipped: it went in after the ones that committed before it
    const lateRow = rows.find((r) => r.entity_id === 'late')!;
    expect(Number(lateRow.leaf_index)).toBeGreaterThan(before);

    // every inclusion proof verifies against a head signed with the plant's key
    const heads = new Map<number, SignedHead>();
    for (const r of rows) {
      const rec = await receiptFor(t.sequelize, r.id, opts);
      expect(rec.leafIndex).toBe(Number(r.leaf_index));
      expect(checkHead(rec.head, [signer])).toBe('valid');
      const leaf = entryLeafHash(rec.entry);
      expect(
        verifyInclusion(rfc6962, rec.leafIndex, rec.treeSize, leaf, rec.proof.map(fromHex), fromHex(rec.rootHash)),
      ).toBe(true);
      heads.set(rec.head.treeSize, rec.head);
    }
    // and the heads it used only ever grew: each is consistent with the next (RFC 9162 §2.1.4)
    const sizes = [...heads.keys()].sort((a, b) => a - b);
    for (let i = 1; i < sizes.length; i++) {
      const [a, b] = [heads.get(sizes[i - 1]!)!, heads.get(sizes[i]!)!];
      const res = await request(t.app).get(`/api/audit/log/consistency?from=${a.treeSize}&to=${b.treeSize}`);
      expect(res.status).toBe(200);
      expect(
        verifyConsistency(
          rfc6962,
          a.treeSize,
          b.treeSize,
          res.body.proof.map(fromHex),
          fromHex(a.rootHash),
          fromHex(b.rootHash),
        ),
      ).toBe(true);
    }
  }, 60_000);

  it('when four sequencers run at once while writers commit, then no event gets two leaves and none is lost', async () => {
    const entity = unique('seq');
    const ctx = systemCtx('ledger-seq');
    const writers = Array.from({ length: 40 }, (_, i) =>
      sleep(Math.random() * 100).then(() =>
        t.sequelize.transaction((transaction) =>
          recordAudit(ctx, transaction, { action: 'drill.write', entity, entityId: `w${i}`, after: { i } }),
        ),
      ),
    );
    let stop = false;
    const sequencers = Array.from({ length: 4 }, async () => {
      let ran = 0;
      while (!stop) {
        const r = await integratePass(t.sequelize, opts);
        if (r.ran) ran += 1;
        await sleep(5);
      }
      return ran;
    });
    await Promise.all(writers);
    await integrateAll(t.sequelize, opts);
    stop = true;
    const passes = await Promise.all(sequencers);
    expect(passes.reduce((a, b) => a + b, 0)).toBeGreaterThan(0);
    const rows = await placed(entity);
    expect(rows).toHaveLength(40);
    expect(rows.every((r) => r.leaf_index !== null)).toBe(true);
    const [dupes] = await t.sequelize.query<{ n: number }>(
      `SELECT count(*)::int AS n FROM audit_leaves l JOIN audit_events e ON e.id = l.event_id WHERE e.entity = $1
        GROUP BY l.event_id HAVING count(*) > 1`,
      { type: QueryTypes.SELECT, bind: [entity] },
    );
    expect(dupes).toBeUndefined();
  }, 30_000);

  it('when an audited write commits, then it took no advisory lock and read no earlier event', async () => {
    // the write path's statements, from the transaction's own view of its locks
    const locks = await t.sequelize.transaction(async (transaction) => {
      await recordAudit(systemCtx('lockless'), transaction, {
        action: 'drill.write',
        entity: unique('nl'),
        entityId: 1,
      });
      return t.sequelize.query<{ n: number }>(
        "SELECT count(*)::int AS n FROM pg_locks WHERE locktype = 'advisory' AND pid = pg_backend_pid()",
        { type: QueryTypes.SELECT, transaction },
      );
    });
    expect(locks[0]!.n).toBe(0);
  });
});

describe('the log over HTTP', () => {
  it('when anyone asks for the latest head, then it is signed with the published key and verifies', async () => {
    await integrateAll(t.sequelize, { ...opts, forceHead: true });
    const res = await request(t.app).get('/api/audit/log/head');
    expect(res.status).toBe(200);
    expect(res.body.key).toEqual({ keyId: signer.keyId, publicKey: signer.publicKey });
    expect(checkHead(res.body.head, [res.body.key])).toBe('valid');
  });

  it('when a consistency proof is asked for sizes the log does not have, then the answer is a 400 that names the field', async () => {
    const big = await request(t.app).get('/api/audit/log/consistency?from=1&to=999999999999');
    expect(big.status).toBe(400);
    expect(big.body.error.fields).toHaveProperty('to');
    const backwards = await request(t.app).get('/api/audit/log/consistency?from=5&to=2');
    expect(backwards.status).toBe(400);
    const junk = await request(t.app).get('/api/audit/log/consistency?from=x&to=2');
    expect(junk.status).toBe(400);
  });

  it('when the quality engineer asks for an event’s proof, then the receipt verifies; an unknown event is 404', async () => {
    const quality = await makeUser('quality');
    const cookie = await cookieFor(quality, t.config);
    const [ev] = await t.sequelize.query<{ id: number }>(
      "SELECT id FROM audit_events WHERE entity = 'user' AND entity_id = $1 ORDER BY id DESC LIMIT 1",
      { type: QueryTypes.SELECT, bind: [String(quality.id)] },
    );
    // the user was made without an audit event: write one for it
    const id =
      ev?.id ??
      (await t.sequelize.transaction(async (transaction) => {
        await recordAudit(systemCtx('proof'), transaction, {
          action: 'drill.write',
          entity: 'user',
          entityId: quality.id,
        });
        const [r] = await t.sequelize.query<{ id: number }>('SELECT max(id) AS id FROM audit_events', {
          type: QueryTypes.SELECT,
          transaction,
        });
        return Number(r!.id);
      }));
    const res = await request(t.app).get(`/api/audit/events/${id}/proof`).set('Cookie', cookie);
    expect(res.status).toBe(200);
    expect(res.body.code).toMatch(/^CT1:[A-Z2-7]+$/);
    expect(
      verifyInclusion(
        rfc6962,
        res.body.leafIndex,
        res.body.treeSize,
        entryLeafHash(res.body.entry),
        res.body.proof.map(fromHex),
        fromHex(res.body.rootHash),
      ),
    ).toBe(true);
    const missing = await request(t.app).get('/api/audit/events/999999999999/proof').set('Cookie', cookie);
    expect(missing.status).toBe(404);
  });

  it('when the admin checks the trail, then the report says how far the log has integrated and that it holds', async () => {
    await integrateAll(t.sequelize, { ...opts, forceHead: true });
    const report = await verifyAudit(t.sequelize, { signer });
    expect(report.firstBroken).toBeNull();
    expect(report.ok).toBe(true);
    expect(report.log.treeSize).toBeGreaterThan(0);
    expect(report.checked).toBe(report.log.treeSize);
    expect(report.heads.total).toBeGreaterThan(0);
  });
});
