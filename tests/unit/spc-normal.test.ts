import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { lnGamma, normalCdf, normalPdf, normalQuantile, normalUpperTail } from '../../shared/domain/spc/normal.js';

const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe('standard normal distribution', () => {
  it('when Φ is evaluated from −6 to 6, then it agrees with jstat to 1e-8 relative', () => {
    for (let z = -6; z <= 6; z += 0.25) {
      expect(rel(normalCdf(z), jStat.normal.cdf(z, 0, 1))).toBeLessThan(1e-8);
      expect(normalPdf(z)).toBeCloseTo(jStat.normal.pdf(z, 0, 1), 14);
    }
  });

  it('when z is the familiar table values, then Φ gives them (e-Handbook §1.3.6.7.1 normal table)', () => {
    expect(normalCdf(-3)).toBeCloseTo(0.00135, 5);
    expect(normalCdf(1.96)).toBeCloseTo(0.975, 4);
    expect(normalCdf(0)).toBe(0.5);
  });

  it('when z is far in the tail, then Φ keeps its relative precision (SciPy 1.17.1 special.ndtr, computed once)', () => {
    // jstat's erf loses digits beyond about 6σ, so these come from SciPy
    expect(rel(normalCdf(-8), 6.22096057427174e-16)).toBeLessThan(1e-8);
    expect(rel(normalCdf(-10), 7.61985302416047e-24)).toBeLessThan(1e-8);
    expect(rel(normalUpperTail(6), 9.865876450376946e-10)).toBeLessThan(1e-8);
  });

  it('when Φ⁻¹ is evaluated, then it agrees with jstat and with the familiar 1.959964 (e-Handbook §1.3.6.7.1)', () => {
    expect(normalQuantile(0.975)).toBeCloseTo(1.959964, 6);
    for (const p of [1e-6, 0.001, 0.02425, 0.1, 0.5, 0.8, 0.97575, 0.999]) {
      expect(normalQuantile(p)).toBeCloseTo(jStat.normal.inv(p, 0, 1), 8);
    }
    expect(normalQuantile(1e-12)).toBeCloseTo(-7.034483825301131, 8); // SciPy special.ndtri, computed once
  });

  it('when a probability is outside [0, 1], then the quantile refuses it', () => {
    expect(() => normalQuantile(1.5)).toThrow(RangeError);
    expect(() => normalQuantile(Number.NaN)).toThrow(RangeError);
    expect(normalQuantile(0)).toBe(-Infinity);
  });

  it('when ln Γ is evaluated, then it agrees with jstat and with Γ(1/2) = √π, Γ(5) = 24 (exact)', () => {
    expect(lnGamma(0.5)).toBeCloseTo(Math.log(Math.sqrt(Math.PI)), 12);
    expect(lnGamma(5)).toBeCloseTo(Math.log(24), 12);
    for (const x of [0.3, 1.5, 2.5, 7.5, 24.5, 199.5]) expect(lnGamma(x)).toBeCloseTo(jStat.gammaln(x), 9);
    expect(() => lnGamma(0)).toThrow(RangeError);
  });
});
