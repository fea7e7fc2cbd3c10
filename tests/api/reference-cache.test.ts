import { randomUUID } from 'node:crypto';
import pg from 'pg';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nominalSizeClasses, passingReadings } from '../../db/seeders/sample-readings.js';
import { referenceData } from '../../server/services/reference-cache.js';
import { cookieFor, makeTestApp, makeUser, unique, type TestApp } from '../support/app.js';
import { formFor, gaugesOf, passThrough, tornDownCore } from '../support/parts.js';

// Each API process keeps the reference data in memory behind a version the database bumps on every
// change. "Another process" here is a plain connection of its own changing the tables directly.
let t: TestApp;
let other: pg.Client;
let receiving: string;
let operator: string;

beforeAll(async () => {
  t = makeTestApp();
  other = new pg.Client({ connectionString: t.config.DATABASE_URL });
  await other.connect();
  receiving = await cookieFor(await makeUser('receiving'), t.config);
  operator = await cookieFor(await makeUser('operator'), t.config);
});
afterAll(async () => {
  await other.end();
  await t.close();
});

describe('reference data kept in memory', () => {
  it('when another process adds a gauge and then takes it out of service, then forms and submissions follow at once', async () => {
    const parts = await tornDownCore(t, { receiving, operator }, 'CORRIE-8');
    await passThrough(t, operator, ['CLN-1', 'MPI-1', 'PT-1', 'LH-1'], parts.block);
    const before = await formFor(t, operator, 'BH-1', parts.block); // fills this process's copy
    // sorts after the demo's gauges, so tests that take the first usable gauge never pick it
    const code = `ZZ-${unique('').slice(0, 6).toUpperCase()}`;
    expect(before.gauges.some((g) => g.code === code)).toBe(false);

    await other.query(
      // calibrated, with a range that reaches the bores: a gauge with no calibration is never usable
      `INSERT INTO gauges (code, description, kind, resolution, unit, range_low, range_high, calibrated, calibration_due_on)
       VALUES ($1, 'Bore gauge on loan', 'bore gauge', 0.0001, 'in', 3, 6, true, current_date + 90)`,
      [code],
    );
    const added = await formFor(t, operator, 'BH-1', parts.block);
    expect(added.gauges.find((g) => g.code === code)).toMatchObject({ usable: true });

    await other.query("UPDATE gauges SET status = 'out_for_calibration' WHERE code = $1", [code]);
    const res = await request(t.app)
      .post('/api/results')
      .set('Cookie', operator)
      .send({
        idempotencyKey: randomUUID(),
        serial: parts.block,
        station: 'BH-1',
        ...gaugesOf(added),
        gauge: code,
        readings: passingReadings(added),
        sizeClasses: nominalSizeClasses(added),
      });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(new RegExp(`${code} cannot be used: Out for calibration`));
    expect((await formFor(t, operator, 'BH-1', parts.block)).gauges.find((g) => g.code === code)).toMatchObject({
      usable: false,
    });
  });

  it('when a transaction changes reference data and reads it, then a rollback leaves nothing of it in memory', async () => {
    const code = `T-${unique('').slice(0, 6).toUpperCase()}`;
    await other.query(
      `INSERT INTO stations (code, name, stage_id, location)
       VALUES ($1, 'Spare hone', (SELECT id FROM stages WHERE code = 'bore-hone'), 'Bay 9')`,
      [code],
    );
    expect((await referenceData(t.sequelize)).station(code)?.name).toBe('Spare hone');

    const inside = await t.sequelize
      .transaction(async (transaction) => {
        await t.sequelize.query('UPDATE stations SET name = :name WHERE code = :code', {
          replacements: { name: 'Renamed, never committed', code },
          transaction,
        });
        const seen = (await referenceData(t.sequelize, transaction)).station(code)?.name;
        throw Object.assign(new Error('roll back'), { seen });
      })
      .catch((err: Error & { seen?: string }) => err.seen);
    expect(inside).toBe('Renamed, never committed');

    // the next committed change takes the version number the rolled-back one had used
    await other.query("UPDATE stations SET location = 'Bay 10' WHERE code = $1", [code]);
    expect((await referenceData(t.sequelize)).station(code)).toMatchObject({ name: 'Spare hone', location: 'Bay 10' });
  });
});
