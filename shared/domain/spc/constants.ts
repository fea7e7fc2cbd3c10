import { lnGamma } from './normal.js';

/**
 * Control-chart constants.
 *
 * The range-based constants (d2, d3 and the A2, D3, D4 built on them) have no closed form: d2 and
 * d3 are the mean and standard deviation of the range of n standard normal values, found by
 * numerical integration. Charts therefore use the published three-decimal table, as the NIST/SEMATECH
 * e-Handbook §6.3.2 and ASTM E2587 print it, so that a chart here and a chart drawn by hand from
 * the same table agree to the last digit (the e-Handbook's individuals example divides by 1.128).
 *
 * c4 has a closed form through the gamma function, so it and the s-based constants (A3, B3, B4)
 * are computed for any subgroup size; for n = 2…10 they agree with the printed table within its
 * last digit, which the unit tests check.
 */

export type RangeConstants = { n: number; d2: number; d3: number; A2: number; D3: number; D4: number };

/** ASTM E2587 / e-Handbook §6.3.2 table, subgroup sizes 2…10. */
const RANGE_TABLE: Record<number, RangeConstants> = {
  2: { n: 2, d2: 1.128, d3: 0.853, A2: 1.88, D3: 0, D4: 3.267 },
  3: { n: 3, d2: 1.693, d3: 0.888, A2: 1.023, D3: 0, D4: 2.574 },
  4: { n: 4, d2: 2.059, d3: 0.88, A2: 0.729, D3: 0, D4: 2.282 },
  5: { n: 5, d2: 2.326, d3: 0.864, A2: 0.577, D3: 0, D4: 2.114 },
  6: { n: 6, d2: 2.534, d3: 0.848, A2: 0.483, D3: 0, D4: 2.004 },
  7: { n: 7, d2: 2.704, d3: 0.833, A2: 0.419, D3: 0.076, D4: 1.924 },
  8: { n: 8, d2: 2.847, d3: 0.82, A2: 0.373, D3: 0.136, D4: 1.864 },
  9: { n: 9, d2: 2.97, d3: 0.808, A2: 0.337, D3: 0.184, D4: 1.816 },
  10: { n: 10, d2: 3.078, d3: 0.797, A2: 0.308, D3: 0.223, D4: 1.777 },
};

/** The largest subgroup a range chart is drawn for; beyond it the range wastes information and s is used. */
export const MAX_RANGE_SUBGROUP = 10;

function checkSize(n: number) {
  if (!Number.isInteger(n) || n < 2) throw new RangeError('a subgroup has at least 2 readings');
}

/** d2, d3, A2, D3, D4 for a subgroup of n readings (2…10). */
export function rangeConstants(n: number): RangeConstants {
  checkSize(n);
  const row = RANGE_TABLE[n];
  if (!row) throw new RangeError(`range-chart constants are tabled for subgroups of 2 to ${MAX_RANGE_SUBGROUP}`);
  return row;
}

/** c4(n) = √(2/(n−1)) · Γ(n/2) / Γ((n−1)/2): the mean of s over σ for n normal readings. */
export function c4(n: number): number {
  checkSize(n);
  return Math.sqrt(2 / (n - 1)) * Math.exp(lnGamma(n / 2) - lnGamma((n - 1) / 2));
}

export type SConstants = { n: number; c4: number; A3: number; B3: number; B4: number };

/** A3 = 3/(c4√n); B3, B4 = 1 ∓ 3√(1 − c4²)/c4, B3 floored at 0 (e-Handbook §6.3.2.1). */
export function sConstants(n: number): SConstants {
  const c = c4(n);
  const spread = (3 * Math.sqrt(1 - c * c)) / c;
  return { n, c4: c, A3: 3 / (c * Math.sqrt(n)), B3: Math.max(0, 1 - spread), B4: 1 + spread };
}
