import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { EngineFamily } from '../../server/models/index.js';
import { makeTestApp, type TestApp } from '../support/app.js';

let t: TestApp;
beforeAll(() => {
  t = makeTestApp();
});
afterAll(() => t.close());

describe('numeric columns read back as numbers', () => {
  it('through a model and through raw SQL', async () => {
    const family = await EngineFamily.findOne({ where: { code: 'TARN-6' } });
    expect(family!.boreMm).toBe(94);
    expect(typeof family!.strokeMm).toBe('number');
    const [row] = await t.sequelize.query<{ v: number }>('SELECT 0.000125::numeric(14,6) AS v', {
      type: QueryTypes.SELECT,
    });
    expect(row!.v).toBe(0.000125);
  });
});
