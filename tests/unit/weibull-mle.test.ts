import { jStat } from 'jstat';
import { describe, expect, it } from 'vitest';
import { weibullLogLikelihood, weibullMle } from '../../shared/domain/weibull-mle.js';
import type { LifeRecord, WeibullParameters } from '../../shared/domain/weibull.js';
import { FANS } from './fixtures/nelson-fans.js';

// The npm registry has Weibull densities (jstat, @stdlib) but no censored Weibull fit, so the fit
// is held to (1) R 4.2.2's survival::survreg (Debian r-base-core and r-cran-survival 3.5-3, run by
// hand on the same data, printout pasted beside each check), (2) a published figure, and (3) a
// slow brute-force maximisation of a likelihood written from jstat's Weibull pdf and cdf.

/** ℓ from jstat's density and distribution function: independent of the code under test. */
function jstatLogLikelihood(records: LifeRecord[], { shape, scale }: WeibullParameters): number {
  return records.reduce((s, r) => {
    const term = r.failed
      ? Math.log(jStat.weibull.pdf(r.time, scale, shape))
      : Math.log(1 - jStat.weibull.cdf(r.time, scale, shape));
    return s + (r.count ?? 1) * term;
  }, 0);
}

/** A grid, then a compass search with halving steps: slow, simple, no derivatives. */
function bruteForce(records: LifeRecord[], shapes: [number, number], scales: [number, number]): WeibullParameters {
  let best = { shape: shapes[0], scale: scales[0] };
  let bestLl = -Infinity;
  for (let i = 0; i <= 60; i++) {
    for (let j = 0; j <= 60; j++) {
      const p = {
        shape: shapes[0] + ((shapes[1] - shapes[0]) * i) / 60,
        scale: scales[0] + ((scales[1] - scales[0]) * j) / 60,
      };
      const ll = jstatLogLikelihood(records, p);
      if (ll > bestLl) [best, bestLl] = [p, ll];
    }
  }
  let step = { shape: (shapes[1] - shapes[0]) / 60, scale: (scales[1] - scales[0]) / 60 };
  while (step.shape > 1e-9 * best.shape) {
    let moved = false;
    for (const [ds, dc] of [
      [1, 0],
      [-1, 0],
      [0, 1],
      [0, -1],
    ] as const) {
      const p = { shape: best.shape + ds * step.shape, scale: best.scale + dc * step.scale };
      const ll = jstatLogLikelihood(records, p);
      if (ll > bestLl) [best, bestLl, moved] = [p, ll, true];
    }
    if (!moved) step = { shape: step.shape / 2, scale: step.scale / 2 };
  }
  return best;
}

describe("maximum likelihood on Nelson's 70 diesel engine fans (12 failures, 58 running)", () => {
  const fit = weibullMle(FANS);

  it('when fitted, then β 1.058446, η 26.29685 thousand hours and ℓ −52.25966 (R survreg)', () => {
    // R: survreg(Surv(t, status) ~ 1, dist = "weibull"): 1/scale 1.05844585, exp(coef) 26.29684517,
    // loglik −52.2596566. SAS/QC's RELIABILITY documentation fits the same data and prints shape
    // 1.0584 and scale 26.297 (from memory).
    expect(fit.shape).toBeCloseTo(1.05844585, 7);
    expect(fit.scale).toBeCloseTo(26.29684517, 6);
    expect(fit.logLikelihood).toBeCloseTo(-52.2596566, 6);
    expect(fit).toMatchObject({ failures: 12, suspensions: 58, method: 'maximum-likelihood' });
  });
  it('when the likelihood is maximised by brute force from jstat densities, then it lands on the same β and η', () => {
    const brute = bruteForce(FANS, [0.5, 2.5], [10, 60]);
    expect(brute.shape).toBeCloseTo(fit.shape, 5);
    expect(brute.scale / fit.scale).toBeCloseTo(1, 5);
  });
  it("when ℓ is evaluated at the fit, then the closed form, the code's own ℓ and jstat's agree", () => {
    expect(weibullLogLikelihood(FANS, fit)).toBeCloseTo(fit.logLikelihood, 10);
    expect(jstatLogLikelihood(FANS, fit)).toBeCloseTo(fit.logLikelihood, 8);
  });
  it('when either parameter is nudged, then the likelihood falls (a maximum, not a saddle)', () => {
    for (const [ds, dc] of [
      [1.01, 1],
      [0.99, 1],
      [1, 1.01],
      [1, 0.99],
      [1.01, 1.01],
    ] as const) {
      expect(weibullLogLikelihood(FANS, { shape: fit.shape * ds, scale: fit.scale * dc })).toBeLessThan(
        fit.logLikelihood,
      );
    }
  });
  it('when the time unit changes from thousands of hours to hours, then β is the same and η scales', () => {
    const hours = weibullMle(FANS.map((f) => ({ ...f, time: f.time * 1000 })));
    expect(hours.shape).toBeCloseTo(fit.shape, 10);
    expect(hours.scale / 1000).toBeCloseTo(fit.scale, 7);
  });
});

describe('maximum likelihood on small and grouped data', () => {
  it('when the HotWire 104 data (3 failures, 2 suspensions) are fitted, then β 5.474101, η 4484.191 (R survreg)', () => {
    const fit = weibullMle([
      { time: 2500, failed: false },
      { time: 2730, failed: true },
      { time: 3900, failed: true },
      { time: 4100, failed: false },
      { time: 5000, failed: true },
    ]);
    expect(fit.shape).toBeCloseTo(5.474100624, 6);
    expect(fit.scale).toBeCloseTo(4484.191415, 3);
    expect(fit.logLikelihood).toBeCloseTo(-25.48252181, 6);
  });
  it('when identical units are given with a count, then the fit is that of the units one by one', () => {
    const grouped = [
      { time: 10, failed: true, count: 2 },
      { time: 14, failed: false, count: 3 },
      { time: 20, failed: true, count: 1 },
      { time: 25, failed: false, count: 4 },
    ];
    const expanded = grouped.flatMap((g) =>
      Array.from({ length: g.count }, () => ({ time: g.time, failed: g.failed })),
    );
    const a = weibullMle(grouped);
    const b = weibullMle(expanded);
    expect(a.shape).toBeCloseTo(b.shape, 11);
    expect(a.scale).toBeCloseTo(b.scale, 10);
  });
  it('when a fleet of 50 000 units with 1 in 40 failed is fitted, then it recovers the shape and scale it was drawn from', () => {
    // Deterministic draw: failure times by inversion of F with β 1.8, η 60 months at evenly
    // spread probabilities, each unit's service age 1–36 months; a unit fails if its time comes
    // before its age, else it is a suspension at its age.
    const n = 50_000;
    const records = Array.from({ length: n }, (_, i) => {
      const u = (i + 0.5) / n;
      const life = 60 * (-Math.log(1 - u)) ** (1 / 1.8);
      const age = 1 + ((i * 7919) % 3600) / 100; // a scrambled spread of ages
      return life <= age ? { time: life, failed: true } : { time: age, failed: false };
    });
    const fit = weibullMle(records);
    expect(fit.failures).toBeGreaterThan(n / 60);
    expect(fit.shape).toBeCloseTo(1.8, 1);
    expect(fit.scale / 60).toBeCloseTo(1, 1);
  });
});

describe('data that cannot give a maximum-likelihood fit are refused in words', () => {
  it('when nothing has failed, then it says a failure is needed', () => {
    expect(() => weibullMle([{ time: 5, failed: false }])).toThrow('at least 1 failure');
  });
  it('when no unit outlasted the failures, then it says the shape is not determined', () => {
    expect(() =>
      weibullMle([
        { time: 2, failed: false },
        { time: 5, failed: true },
        { time: 5, failed: true },
      ]),
    ).toThrow('every failure is at the longest time');
    expect(() => weibullMle([{ time: 5, failed: true }, { time: 5, failed: false }])).toThrow('the same time'); // prettier-ignore
  });
  it('when one failure comes before later suspensions, then a fit exists', () => {
    const fit = weibullMle([
      { time: 3, failed: true },
      { time: 8, failed: false },
      { time: 12, failed: false },
    ]);
    expect(fit.shape).toBeGreaterThan(0);
    expect(weibullLogLikelihood([{ time: 3, failed: true }, { time: 8, failed: false }, { time: 12, failed: false }], fit)).toBeCloseTo(fit.logLikelihood, 10); // prettier-ignore
  });
});
