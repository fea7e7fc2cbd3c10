import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ensureReadingPartitions, MONTHS_AHEAD } from '../../server/jobs/reading-partitions.js';
import { cookieFor, makeTestApp, makeUser, type TestApp } from '../support/app.js';
import { firstStageSubmissions } from '../support/drills.js';

// Readings are partitioned by month of created_at (PostgreSQL declarative partitioning, the
// manual's "Table Partitioning" chapter): a reading lands in its month's partition, a query over a
// month reads that partition alone (partition pruning), the next months are made ahead of time,
// and records stay records in every partition.

let t: TestApp;
let resultId: number;
const made: string[] = [];

const rows = <T extends object>(sql: string, bind: unknown[] = []) =>
  t.sequelize.query<T>(sql, { type: QueryTypes.SELECT, bind });

beforeAll(async () => {
  t = makeTestApp();
  const cookies = {
    receiving: await cookieFor(await makeUser('receiving'), t.config),
    operator: await cookieFor(await makeUser('operator'), t.config),
  };
  const [sub] = await firstStageSubmissions(t, cookies, 1);
  const res = await request(t.app).post('/api/results').set('Cookie', cookies.operator).send(sub!.body);
  expect(res.status).toBe(201);
  resultId = res.body.id;
}, 120_000);

afterAll(async () => {
  // the far-future months this file made hold nothing: dropping them deletes no record
  for (const name of made) await t.sequelize.query(`DROP TABLE IF EXISTS "${name}"`);
  await t?.close();
});

describe('readings by month', () => {
  it('when a result is recorded, then its readings are in the partition of this month', async () => {
    const [key] = await rows<{ key: string }>("SELECT pg_get_partkeydef('readings'::regclass) AS key");
    expect(key!.key).toBe('RANGE (created_at)');
    const where = await rows<{ part: string; n: number }>(
      `SELECT tableoid::regclass::text AS part, count(*)::int AS n FROM readings WHERE stage_result_id = $1 GROUP BY 1`,
      [resultId],
    );
    const [month] = await rows<{ name: string }>("SELECT 'readings_' || to_char(now(), 'YYYY_MM') AS name");
    expect(where).toHaveLength(1);
    expect(where[0]!.part).toBe(month!.name);
    expect(where[0]!.n).toBeGreaterThan(0);
  });

  it('when a month is asked for, then the plan reads that partition alone', async () => {
    const plan = await rows<{ 'QUERY PLAN': string }>(
      `EXPLAIN (FORMAT JSON) SELECT count(*) FROM readings
        WHERE created_at >= date_trunc('month', now()) AND created_at < date_trunc('month', now()) + interval '1 month'`,
    );
    const relations = new Set<string>();
    const walk = (n: Record<string, unknown>) => {
      if (typeof n['Relation Name'] === 'string') relations.add(n['Relation Name']);
      for (const c of (n.Plans as Record<string, unknown>[] | undefined) ?? []) walk(c);
    };
    const json = plan[0]!['QUERY PLAN'] as unknown as { Plan: Record<string, unknown> }[];
    walk(json[0]!.Plan);
    const [month] = await rows<{ name: string }>("SELECT 'readings_' || to_char(now(), 'YYYY_MM') AS name");
    // pruned at run time when the bounds are not constants: the plan keeps the partitions it may read
    expect([...relations].every((r) => r.startsWith('readings_'))).toBe(true);
    expect(relations.has(month!.name)).toBe(true);
    expect(relations.has('readings_default')).toBe(false);
  });

  it('when the next months are made, then each missing month gets its partition once', async () => {
    // far ahead, so this file's months are its own
    const at = new Date(Date.UTC(2031, 4, 17, 12));
    const first = await ensureReadingPartitions(t.sequelize, at);
    made.push(...first);
    expect(first).toEqual(
      Array.from({ length: MONTHS_AHEAD + 1 }, (_, i) => `readings_2031_${String(5 + i).padStart(2, '0')}`),
    );
    expect(await ensureReadingPartitions(t.sequelize, at)).toEqual([]);
    // what this plant has now: this month and the next MONTHS_AHEAD exist
    expect(await ensureReadingPartitions(t.sequelize)).toEqual([]);
  });

  it('when a reading falls in a month with no partition, then the default keeps it and no partition is made over it', async () => {
    const [r] = await rows<{ characteristic_id: number; position: string }>(
      'SELECT characteristic_id, position FROM readings WHERE stage_result_id = $1 LIMIT 1',
      [resultId],
    );
    await t.sequelize.query(
      `INSERT INTO readings (stage_result_id, characteristic_id, position, verdict, created_at)
       VALUES ($1, $2, $3, 'pass', '1999-01-15T10:00:00Z')`,
      { bind: [resultId, r!.characteristic_id, r!.position] },
    );
    const [inDefault] = await rows<{ n: number }>(
      `SELECT count(*)::int AS n FROM readings_default WHERE stage_result_id = $1`,
      [resultId],
    );
    expect(inDefault!.n).toBe(1);
    const [made1999] = await rows<{ made: string[] }>(
      "SELECT ensure_reading_partitions('1999-01-01', '1999-02-01') AS made",
    );
    expect(made1999!.made).toEqual([]);
    const [still] = await rows<{ n: number }>(
      `SELECT count(*)::int AS n FROM readings_default WHERE stage_result_id = $1`,
      [resultId],
    );
    expect(still!.n).toBe(1);
  });

  it('when a reading in a partition is edited or deleted, then the database refuses: records are never changed', async () => {
    await expect(
      t.sequelize.query('UPDATE readings SET value = 0 WHERE stage_result_id = $1', { bind: [resultId] }),
    ).rejects.toThrow(/records: add a correcting result instead/);
    await expect(
      t.sequelize.query('DELETE FROM readings WHERE stage_result_id = $1', { bind: [resultId] }),
    ).rejects.toThrow(/records/);
  });
});

describe('result values: a result’s readings of one characteristic side by side', () => {
  it('when a result is recorded, then result_values holds exactly its readings, in the order stored', async () => {
    const readings = await rows<{ characteristic_id: number; position: string; value: string | null; verdict: string }>(
      `SELECT characteristic_id, position, value, verdict FROM readings WHERE stage_result_id = $1 ORDER BY id`,
      [resultId],
    );
    const values = await rows<{
      characteristic_id: number;
      positions: string[];
      vals: (number | null)[];
      verdicts: string[];
    }>(
      `SELECT characteristic_id, positions, vals, verdicts FROM result_values WHERE stage_result_id = $1 ORDER BY characteristic_id`,
      [resultId],
    );
    const chars = [...new Set(readings.map((r) => r.characteristic_id))].sort((a, b) => a - b);
    expect(values.map((v) => v.characteristic_id)).toEqual(chars);
    for (const v of values) {
      const mine = readings.filter((r) => r.characteristic_id === v.characteristic_id);
      expect(v.positions).toEqual(mine.map((r) => r.position));
      expect(v.vals).toEqual(mine.map((r) => (r.value === null ? null : Number(r.value))));
      expect(v.verdicts).toEqual(mine.map((r) => r.verdict));
    }
  });

  it('when more readings of the same result arrive in a later statement, then they are added after the first', async () => {
    const [first] = await rows<{ characteristic_id: number; n: number }>(
      `SELECT characteristic_id, cardinality(positions) AS n FROM result_values WHERE stage_result_id = $1
        ORDER BY characteristic_id LIMIT 1`,
      [resultId],
    );
    await t.sequelize.query(
      `INSERT INTO readings (stage_result_id, characteristic_id, position, value, verdict)
       VALUES ($1, $2, 'late-1', 1.25, 'pass'), ($1, $2, 'late-2', NULL, 'fail')`,
      { bind: [resultId, first!.characteristic_id] },
    );
    const [after] = await rows<{ positions: string[]; vals: (number | null)[]; verdicts: string[] }>(
      `SELECT positions, vals, verdicts FROM result_values WHERE stage_result_id = $1 AND characteristic_id = $2`,
      [resultId, first!.characteristic_id],
    );
    expect(after!.positions).toHaveLength(first!.n + 2);
    expect(after!.positions.slice(-2)).toEqual(['late-1', 'late-2']);
    expect(after!.vals.slice(-2)).toEqual([1.25, null]);
    expect(after!.verdicts.slice(-2)).toEqual(['pass', 'fail']);
  });
});
