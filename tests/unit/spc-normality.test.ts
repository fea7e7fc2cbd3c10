import { describe, expect, it } from 'vitest';
import { andersonDarling, andersonDarlingPValue, normalityCheck } from '../../shared/domain/spc/normality.js';
import { normalDraws, seeded } from '../support/spc.js';

// e-Handbook §6.3.2.2 flow-rate batches (published data) and a right-skewed set of our own.
const FLOW = [49.6, 47.6, 49.9, 51.3, 47.8, 51.2, 52.6, 52.4, 53.6, 52.1];
const SKEWED = [0.1, 0.2, 0.2, 0.3, 0.3, 0.4, 0.5, 0.6, 0.8, 1.1, 1.5, 2.3, 3.7, 6.0];

describe('Anderson–Darling test of normality (e-Handbook §1.3.5.14; D’Agostino & Stephens 1986)', () => {
  it('when A² is computed, then it equals SciPy’s stats.anderson statistic (SciPy 1.17.1, computed once)', () => {
    expect(andersonDarling(FLOW)).toBeCloseTo(0.3048580492709476, 9);
    expect(andersonDarling(SKEWED)).toBeCloseTo(1.6180389477556592, 9);
  });

  it('when the adjusted statistic is at the tabled percentage points, then the p-value is that point’s level (D’Agostino & Stephens Table 4.7, from memory)', () => {
    const points: [number, number][] = [
      [0.631, 0.1],
      [0.752, 0.05],
      [0.873, 0.025],
      [1.035, 0.01],
    ];
    for (const [a, level] of points) expect(Math.abs(andersonDarlingPValue(a) / level - 1)).toBeLessThan(0.03);
  });

  it('when the four pieces of Stephens’ approximation meet, then the p-value joins within 0.005', () => {
    for (const join of [0.2, 0.34, 0.6]) {
      expect(Math.abs(andersonDarlingPValue(join - 1e-9) - andersonDarlingPValue(join))).toBeLessThan(0.005);
    }
    expect(andersonDarlingPValue(0)).toBeCloseTo(1, 5);
    expect(andersonDarlingPValue(20)).toBeLessThan(1e-40);
  });

  it('when the e-Handbook’s flow data are checked, then normality is not rejected; the skewed set is rejected', () => {
    const flow = normalityCheck(FLOW);
    expect(flow).toMatchObject({ checked: true, n: 10, normal: true });
    if (flow.checked) expect(flow.a2Adjusted).toBeCloseTo(0.3048580492709476 * (1 + 0.075 + 0.0225), 9);
    const skewed = normalityCheck(SKEWED);
    expect(skewed).toMatchObject({ checked: true, normal: false });
    if (skewed.checked) expect(skewed.pValue).toBeLessThan(0.01);
  });

  it('when 2000 normal samples of 30 are checked at 5 %, then 3.5 % to 6.5 % are rejected (the p-value is calibrated; simulation)', () => {
    const random = seeded(1990);
    let rejected = 0;
    for (let t = 0; t < 2000; t++) {
      const r = normalityCheck(normalDraws(random, 30, 10, 2));
      if (r.checked && !r.normal) rejected++;
    }
    expect(rejected / 2000).toBeGreaterThan(0.035);
    expect(rejected / 2000).toBeLessThan(0.065);
  });

  it('when samples of 50 come from an exponential distribution, then nearly all are rejected (simulation)', () => {
    const random = seeded(86);
    let rejected = 0;
    for (let t = 0; t < 200; t++) {
      const r = normalityCheck(Array.from({ length: 50 }, () => -Math.log(1 - random())));
      if (r.checked && !r.normal) rejected++;
    }
    expect(rejected).toBeGreaterThan(190);
  });

  it('when there are fewer than eight readings or they never vary, then the check is not made and says why', () => {
    expect(normalityCheck([1, 2, 3])).toEqual({ checked: false, n: 3, reason: 'fewer than 8 readings' });
    expect(normalityCheck(Array(12).fill(4.03))).toMatchObject({ checked: false, reason: 'the readings do not vary' });
  });

  it('when one reading is wildly far out, then A² stays finite (JSON can carry it) and p is about 0', () => {
    const r = normalityCheck([...FLOW, 1e9]);
    expect(r.checked && Number.isFinite(r.a2)).toBe(true);
    expect(r.checked && r.pValue).toBeLessThan(1e-6);
  });
});
