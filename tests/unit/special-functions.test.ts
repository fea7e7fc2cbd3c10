import { jStat } from 'jstat';
import { describe, expect, it } from 'vitest';
import { betaQuantile, fCdf, fUpperTail, incompleteBeta, lnGamma } from '../../shared/domain/special-functions.js';

// References: jstat 1.9.6 from the npm registry (devDependency, used by tests only); R 4.2.2 from
// Debian's r-base-core (pf, qbeta; run by hand, figures pasted with their calls); and exact values
// that follow from the definitions. jstat's own F and beta routines carry errors near 1e-10 (R
// shows it), so the checks against jstat allow 1e-9 and those against R 1e-13.

describe('log-gamma', () => {
  it('when the argument is a whole number, then Γ(n) = (n − 1)! (definition)', () => {
    expect(lnGamma(1)).toBeCloseTo(0, 13);
    expect(lnGamma(5)).toBeCloseTo(Math.log(24), 13);
    expect(lnGamma(11)).toBeCloseTo(Math.log(3628800), 12);
  });
  it('when the argument is ½, then Γ(½) = √π (definition)', () => {
    expect(lnGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 13);
  });
  it('when compared with jstat.gammaln over a spread of arguments, then they agree to 1e-12 relative', () => {
    for (const x of [0.01, 0.3, 0.9, 1.5, 2.5, 7.25, 30, 60.5, 150]) {
      expect(Math.abs(lnGamma(x) - jStat.gammaln(x))).toBeLessThan(1e-12 * Math.max(1, Math.abs(jStat.gammaln(x))));
    }
  });
  it('when the argument is not positive, then it refuses', () => {
    expect(() => lnGamma(0)).toThrow(RangeError);
    expect(() => lnGamma(-1)).toThrow(RangeError);
  });
});

describe('regularized incomplete beta', () => {
  it('when a = b = 1, then I_x(1, 1) = x (uniform distribution)', () => {
    for (const x of [0.1, 0.37, 0.9]) expect(incompleteBeta(x, 1, 1)).toBeCloseTo(x, 14);
  });
  it('when b = 1, then I_x(a, 1) = x^a (definition)', () => {
    expect(incompleteBeta(0.3, 2.5, 1)).toBeCloseTo(0.3 ** 2.5, 14);
  });
  it('when compared with jstat.ibeta on both sides of the mean, then they agree to 1e-10', () => {
    for (const [x, a, b] of [
      [0.3, 2, 5],
      [0.8, 2, 5],
      [0.5, 9, 30],
      [0.05, 0.5, 0.5],
      [0.999, 40, 2],
      [0.2, 30, 39],
    ] as const) {
      expect(incompleteBeta(x, a, b)).toBeCloseTo(jStat.ibeta(x, a, b), 10);
    }
  });
  it('when x is at or past either end, then it is 0 or 1', () => {
    expect(incompleteBeta(0, 2, 3)).toBe(0);
    expect(incompleteBeta(1, 2, 3)).toBe(1);
  });
});

describe('F distribution', () => {
  // Degrees of freedom as a gauge study has them: 2 and 9 main effects, 18 interaction, 60 error.
  const cases = [
    [0.4337, 18, 60],
    [34.44, 2, 60],
    [3.15, 2, 60],
    [1.9, 9, 78],
    [0.05, 4, 10],
    [12, 1, 1],
  ] as const;
  it('when compared with jstat.centralF.cdf, then cdf and upper tail agree to 1e-9', () => {
    for (const [f, d1, d2] of cases) {
      expect(fCdf(f, d1, d2)).toBeCloseTo(jStat.centralF.cdf(f, d1, d2), 9);
      expect(fUpperTail(f, d1, d2)).toBeCloseTo(1 - jStat.centralF.cdf(f, d1, d2), 9);
    }
  });
  it('when compared with R, then the cdf agrees to 1e-13', () => {
    // R 4.2.2: pf(c(0.4337, 34.44, 3.15, 1.9, 0.05, 12), c(18, 2, 2, 9, 4, 1), c(60, 60, 60, 78, 10, 1))
    const r = [
      0.025887150435044668, 0.999999999890611502, 0.949981385312668514, 0.935898278751376322, 0.005472051951464895,
      0.821087624977933195,
    ];
    cases.forEach(([f, d1, d2], i) => expect(fCdf(f, d1, d2)).toBeCloseTo(r[i]!, 13));
  });
  it('when the p-value is tiny, then the upper tail keeps its significant digits (R 4.2.2 pf: F 34.44007 on 2 and 60 df → 1.0938e-10)', () => {
    // R: pf(34.44007, 2, 60, lower.tail = FALSE), R from Debian's r-base-core 4.2.2
    expect(fUpperTail(34.44007, 2, 60) / 1.0938e-10).toBeCloseTo(1, 3);
  });
  it('when F is 1 with equal degrees of freedom, then P(F ≤ 1) = ½ (symmetry of ln F)', () => {
    expect(fCdf(1, 7, 7)).toBeCloseTo(0.5, 13);
  });
  it('when the degrees of freedom are not positive, then it refuses', () => {
    expect(() => fUpperTail(2, 0, 5)).toThrow(RangeError);
  });
});

describe('beta quantile', () => {
  const cases = [
    [0.025, 3, 48],
    [0.975, 4, 47],
    [0.5, 0.5, 0.5],
    [0.05, 50, 1],
  ] as const;
  it('when compared with jstat.beta.inv, then they agree to 1e-7', () => {
    for (const [p, a, b] of cases) expect(betaQuantile(p, a, b)).toBeCloseTo(jStat.beta.inv(p, a, b), 7);
  });
  it('when compared with R, then they agree to 1e-13', () => {
    // R 4.2.2: qbeta(c(0.025, 0.975, 0.5, 0.05), c(3, 4, 0.5, 50), c(48, 47, 0.5, 1))
    const r = [0.01254858783533407, 0.16548194660377291, 0.49999999999999989, 0.94184492088302774];
    cases.forEach(([p, a, b], i) => expect(betaQuantile(p, a, b)).toBeCloseTo(r[i]!, 13));
  });
  it('when b = 1, then the quantile is p^(1/a) (definition)', () => {
    expect(betaQuantile(0.05, 50, 1)).toBeCloseTo(0.05 ** (1 / 50), 13);
  });
});
