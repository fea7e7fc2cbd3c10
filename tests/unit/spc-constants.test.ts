import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { c4, rangeConstants, sConstants } from '../../shared/domain/spc/constants.js';

// Published three-decimal table (ASTM E2587, the same rows as e-Handbook §6.3.2 and Pyzdek's handbook,
// recomputed here with jStat below; tables differ in the last digit, so ±0.001).
const PUBLISHED_R: [number, number, number, number, number][] = [
  // n, A2, D3, D4, d2
  [2, 1.88, 0, 3.267, 1.128],
  [3, 1.023, 0, 2.575, 1.693],
  [4, 0.729, 0, 2.282, 2.059],
  [5, 0.577, 0, 2.114, 2.326],
  [6, 0.483, 0, 2.004, 2.534],
  [7, 0.419, 0.076, 1.924, 2.704],
  [8, 0.373, 0.136, 1.864, 2.847],
  [9, 0.337, 0.184, 1.816, 2.97],
  [10, 0.308, 0.223, 1.777, 3.078],
];

// X̄–S factors as the NIST/SEMATECH e-Handbook §6.3.2.1 and ASTM E2587 print them (from memory;
// the same figures appear in common SPC handbooks' tables), ±0.001 and c4 ±0.0001.
const PUBLISHED_S: [number, number, number, number, number][] = [
  // n, c4, A3, B3, B4
  [2, 0.7979, 2.659, 0, 3.267],
  [3, 0.8862, 1.954, 0, 2.568],
  [4, 0.9213, 1.628, 0, 2.266],
  [5, 0.94, 1.427, 0, 2.089],
  [6, 0.9515, 1.287, 0.03, 1.97],
  [7, 0.9594, 1.182, 0.118, 1.882],
  [8, 0.965, 1.099, 0.185, 1.815],
  [9, 0.9693, 1.032, 0.239, 1.761],
  [10, 0.9727, 0.975, 0.284, 1.716],
];

const within = (actual: number, expected: number, tol: number) =>
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(tol + 1e-12);

/**
 * d2 and d3 recomputed from their definitions with jstat's normal distribution, by the trapezoid
 * rule on a grid: d2 = ∫ 1 − Φⁿ − (1 − Φ)ⁿ dx (Tippett 1925), and E[R²] = 2∬_{x<y} 1 − Φ(y)ⁿ −
 * (1 − Φ(x))ⁿ + (Φ(y) − Φ(x))ⁿ dx dy, so d3 = √(E[R²] − d2²).
 */
function rangeMoments(n: number) {
  const h = 0.02;
  const xs = Array.from({ length: 801 }, (_, i) => -8 + i * h);
  const F = xs.map((x) => jStat.normal.cdf(x, 0, 1));
  let d2 = 0;
  for (const f of F) d2 += (1 - f ** n - (1 - f) ** n) * h;
  let er2 = 0;
  for (let i = 0; i < F.length; i++) {
    for (let j = i; j < F.length; j++) {
      const w = (i === j ? 0.5 : 1) * h * h;
      er2 += w * (1 - F[j]! ** n - (1 - F[i]!) ** n + (F[j]! - F[i]!) ** n);
    }
  }
  return { d2, d3: Math.sqrt(2 * er2 - d2 * d2) };
}

describe('range-chart constants (ASTM E2587 / e-Handbook §6.3.2)', () => {
  it.each(PUBLISHED_R)(
    'when n = %i, then A2, D3, D4 and d2 are the published values within ±0.001',
    (n, A2, D3, D4, d2) => {
      const k = rangeConstants(n);
      within(k.A2, A2, 0.001);
      within(k.D3, D3, 0.001);
      within(k.D4, D4, 0.001);
      within(k.d2, d2, 0.001);
    },
  );

  it('when d2 and d3 are recomputed by integrating the normal range distribution (jstat), then every tabled row agrees within ±0.001', () => {
    for (const [n] of PUBLISHED_R) {
      const k = rangeConstants(n);
      const m = rangeMoments(n);
      within(k.d2, m.d2, 0.001);
      within(k.d3, m.d3, 0.001);
      // A2 = 3/(d2√n), D3 = max(0, 1 − 3d3/d2), D4 = 1 + 3d3/d2 (e-Handbook §6.3.2.1)
      within(k.A2, 3 / (m.d2 * Math.sqrt(n)), 0.001);
      within(k.D3, Math.max(0, 1 - (3 * m.d3) / m.d2), 0.001);
      within(k.D4, 1 + (3 * m.d3) / m.d2, 0.001);
    }
  });

  it('when the subgroup is smaller than 2 or larger than the table, then it is refused', () => {
    expect(() => rangeConstants(1)).toThrow(RangeError);
    expect(() => rangeConstants(11)).toThrow(/2 to 10/);
    expect(() => rangeConstants(2.5)).toThrow(RangeError);
  });
});

describe('s-chart constants from c4 (e-Handbook §6.3.2.1)', () => {
  it.each(PUBLISHED_S)('when n = %i, then c4, A3, B3 and B4 match the printed table', (n, c, A3, B3, B4) => {
    const k = sConstants(n);
    within(k.c4, c, 0.0001);
    within(k.A3, A3, 0.001);
    within(k.B3, B3, 0.001);
    within(k.B4, B4, 0.001);
  });

  it('when c4 is computed for any n, then it equals √(2/(n−1))·Γ(n/2)/Γ((n−1)/2) with jstat’s log-gamma', () => {
    for (const n of [2, 3, 7, 11, 25, 48, 100, 400]) {
      const ref = Math.sqrt(2 / (n - 1)) * Math.exp(jStat.gammaln(n / 2) - jStat.gammaln((n - 1) / 2));
      expect(c4(n)).toBeCloseTo(ref, 10);
    }
  });

  it('when n is large, then c4 approaches 4(n−1)/(4n−3) (Montgomery’s approximation, from memory)', () => {
    for (const n of [25, 50, 100]) within(c4(n), (4 * (n - 1)) / (4 * n - 3), 1e-4);
    expect(c4(25)).toBeCloseTo(0.9896, 4); // ASTM E2587 table, n = 25 (from memory)
  });
});
