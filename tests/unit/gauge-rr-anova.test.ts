import { jStat } from 'jstat';
import { lusolve, multiply, transpose } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { anovaGaugeStudy } from '../../shared/domain/gauge-rr-anova.js';
import type { AnovaRow } from '../../shared/domain/gauge-rr-anova.js';
import type { GaugeStudyGrid } from '../../shared/domain/gauge-study.js';
import { AIAG_READINGS } from './fixtures/msa-aiag.js';

// Three independent references: R 4.2.2's aov (Debian r-base-core; run by hand on the same data,
// its printout pasted beside each check), sums of squares refitted here by least squares with
// mathjs (a devDependency), and F tail probabilities from jstat (a devDependency).

/** Sequential sums of squares by least squares on dummy-coded nested models. */
function leastSquaresSS(grid: GaugeStudyGrid) {
  const rows = grid.flatMap((parts, a) => parts.flatMap((trials, p) => trials.map((y) => ({ a, p, y }))));
  const k = grid.length;
  const n = grid[0]!.length;
  const dummies = (level: number, count: number) =>
    Array.from({ length: count - 1 }, (_, i) => (level === i + 1 ? 1 : 0));
  const design = (terms: number) =>
    rows.map(({ a, p }) => {
      const da = dummies(a, k);
      const dp = dummies(p, n);
      const x = [1];
      if (terms >= 1) x.push(...da);
      if (terms >= 2) x.push(...dp);
      if (terms >= 3) x.push(...da.flatMap((u) => dp.map((v) => u * v)));
      return x;
    });
  const y = rows.map((r) => r.y);
  const rss = (terms: number) => {
    const X = design(terms);
    const Xt = transpose(X);
    const b = (lusolve(multiply(Xt, X), multiply(Xt, y)) as number[][]).map((v) => v[0]!);
    return X.reduce((s, x, i) => s + (y[i]! - x.reduce((t, xi, j) => t + xi * b[j]!, 0)) ** 2, 0);
  };
  const [r0, r1, r2, r3] = [0, 1, 2, 3].map(rss) as [number, number, number, number];
  return { a: r0 - r1, p: r1 - r2, ap: r2 - r3, e: r3, t: r0 };
}

const rowOf = (t: AnovaRow[], source: string) => t.find((r) => r.source === source)!;

describe('the AIAG MSA 4th edition study by ANOVA', () => {
  const r = anovaGaugeStudy(AIAG_READINGS);
  const t = (s: string) => rowOf(r.table, s);

  it('when the table is built, then sums of squares, mean squares and F match R aov (y ~ a * p)', () => {
    // R: a 2 3.16726 1.583631 34.44007; p 9 88.36193 9.817993 213.51714; a:p 18 0.35898 0.019943
    // 0.43372 (Pr 0.97411); Residuals 60 2.75893 0.045982. The manual's table (from memory) prints
    // 3.1673, 88.3619, 0.3590, 2.7589, total 94.6471 and F 34.44, 213.52, 0.434.
    expect(t('appraiser')).toMatchObject({ df: 2, ss: expect.closeTo(3.16726, 5), ms: expect.closeTo(1.583631, 6) });
    expect(t('part')).toMatchObject({ df: 9, ss: expect.closeTo(88.36193, 5), ms: expect.closeTo(9.817993, 6) });
    expect(t('interaction')).toMatchObject({ df: 18, ss: expect.closeTo(0.35898, 5), ms: expect.closeTo(0.019943, 6) });
    expect(t('repeatability')).toMatchObject({
      df: 60,
      ss: expect.closeTo(2.75893, 5),
      ms: expect.closeTo(0.045982, 6),
    });
    expect(t('total')).toMatchObject({ df: 89, ss: expect.closeTo(94.6471, 4) });
    expect(t('appraiser').f).toBeCloseTo(34.44007, 4);
    expect(t('part').f).toBeCloseTo(213.51714, 4);
    expect(t('interaction').f).toBeCloseTo(0.43372, 5);
    expect(r.interactionP).toBeCloseTo(0.97411, 5);
    expect(t('appraiser').p! / 1.0938e-10).toBeCloseTo(1, 3); // R prints 1.0938e-10
  });
  it('when the sums of squares are refitted by least squares (mathjs), then they agree to 1e-9', () => {
    const ls = leastSquaresSS(AIAG_READINGS);
    expect(t('appraiser').ss).toBeCloseTo(ls.a, 9);
    expect(t('part').ss).toBeCloseTo(ls.p, 9);
    expect(t('interaction').ss).toBeCloseTo(ls.ap, 9);
    expect(t('repeatability').ss).toBeCloseTo(ls.e, 9);
    expect(t('total').ss).toBeCloseTo(ls.t, 9);
  });
  it('when the p-values are taken from jstat on the same F, then they agree to 1e-9', () => {
    for (const s of ['appraiser', 'part', 'interaction']) {
      const row = t(s);
      expect(row.p).toBeCloseTo(1 - jStat.centralF.cdf(row.f!, row.df, 60), 9);
    }
  });
  it('when the interaction p (0.974) is above 0.25, then it is pooled: error MS 0.039973, F 39.61725 and 245.61391 (R aov y ~ a + p)', () => {
    expect(r.pooled).toBe(true);
    const pooled = r.pooledTable!;
    expect(rowOf(pooled, 'repeatability')).toMatchObject({ df: 78, ms: expect.closeTo(0.039973, 6) });
    expect(rowOf(pooled, 'appraiser')).toMatchObject({ f: expect.closeTo(39.61725, 4) });
    expect(rowOf(pooled, 'part')).toMatchObject({ f: expect.closeTo(245.61391, 3) });
    expect(rowOf(pooled, 'appraiser').p! / 1.3376e-12).toBeCloseTo(1, 3); // R prints 1.3376e-12
  });
  it('when the components are estimated, then EV² 0.039973, AV² 0.051455, INT² 0, GRR² 0.091428, PV² 1.086447', () => {
    // The manual's ANOVA variance column (from memory); each also follows from the pooled mean
    // squares above: AV² = (1.583631 − 0.039973)/(10 × 3), PV² = (9.817993 − 0.039973)/(3 × 3).
    expect(r.variance.ev).toBeCloseTo(0.039973, 6);
    expect(r.variance.av).toBeCloseTo(0.051455, 6);
    expect(r.variance.interaction).toBe(0);
    expect(r.variance.grr).toBeCloseTo(0.091428, 5); // the manual adds its rounded figures
    expect(r.variance.pv).toBeCloseTo(1.086447, 6);
    expect(r.variance.tv).toBeCloseTo(1.177875, 6);
  });
  it('when expressed against total variation, then %EV 18.4, %AV 20.9, %GRR 27.9, %PV 96.0 and ndc 4', () => {
    expect(r.percentOfTotal.ev).toBeCloseTo(18.4, 1);
    expect(r.percentOfTotal.av).toBeCloseTo(20.9, 1);
    expect(r.percentOfTotal.grr).toBeCloseTo(27.9, 1);
    expect(r.percentOfTotal.pv).toBeCloseTo(96.0, 1);
    // 1.41 × 1.04233 / 0.30237 = 4.86, truncated: ANOVA's PV is smaller than the range method's
    expect(r.ndcRaw).toBeCloseTo(4.86, 2);
    expect(r.ndc).toBe(4);
    expect(r.verdict).toBe('unacceptable'); // no tolerance: ndc < 5 decides (the product's rule)
  });
  it('when the pooling threshold is set below the interaction p, then nothing is pooled and the interaction term is estimated', () => {
    const unpooled = anovaGaugeStudy(AIAG_READINGS, { poolAbove: 0.99 });
    expect(unpooled.pooled).toBe(false);
    expect(unpooled.pooledTable).toBeNull();
    // MS_AP < MS_E, so σ²_INT = (0.019943 − 0.045982)/3 < 0 is set to 0; AV² = (1.583631 − 0.019943)/30
    expect(unpooled.variance.interaction).toBe(0);
    expect(unpooled.variance.ev).toBeCloseTo(0.045982, 6);
    expect(unpooled.variance.av).toBeCloseTo(0.052123, 6);
  });
});

describe('a study where one appraiser compresses the scale (a strong interaction)', () => {
  // Invented for the test. A reads parts 5.05, 6.05, 6.95 on average; B 5.55, 5.95, 6.55.
  const grid = [
    [
      [5.0, 5.1],
      [6.0, 6.1],
      [7.0, 6.9],
    ],
    [
      [5.6, 5.5],
      [6.0, 5.9],
      [6.5, 6.6],
    ],
  ];
  const r = anovaGaugeStudy(grid);

  it('when analysed, then the table matches R aov: a 0, p 4.206667, a:p 0.42 (F 42, p 0.0002963), error 0.03', () => {
    expect(rowOf(r.table, 'appraiser').ss).toBeCloseTo(0, 12);
    expect(rowOf(r.table, 'part').ss).toBeCloseTo(4.206667, 6);
    expect(rowOf(r.table, 'interaction')).toMatchObject({ ss: expect.closeTo(0.42, 10), f: expect.closeTo(42, 8) });
    expect(r.interactionP).toBeCloseTo(0.0002963, 7);
    expect(rowOf(r.table, 'repeatability').ss).toBeCloseTo(0.03, 10);
    const ls = leastSquaresSS(grid);
    expect(rowOf(r.table, 'interaction').ss).toBeCloseTo(ls.ap, 9);
  });
  it('when the interaction is significant, then it is kept: σ²_INT = (0.21 − 0.005)/2, σ²_PV = (2.103333 − 0.21)/4, AV 0', () => {
    expect(r.pooled).toBe(false);
    expect(r.variance.ev).toBeCloseTo(0.005, 10);
    expect(r.variance.interaction).toBeCloseTo(0.1025, 10);
    expect(r.variance.av).toBe(0); // MS_A (0) < MS_AP: set to zero
    expect(r.variance.pv).toBeCloseTo(0.473333, 6);
    expect(r.percentOfTotal.grr).toBeCloseTo(43.02, 2); // √(0.1075 / 0.580833)
    expect(r.ndc).toBe(2); // 1.41 × √(0.473333 / 0.1075) = 2.96
    expect(r.verdict).toBe('unacceptable');
  });
});

describe('shapes the range method cannot take', () => {
  it('when 4 appraisers measure 12 parts 4 times, then the least-squares sums still agree', () => {
    // A deterministic pseudo-random grid (a linear congruential generator, seed 7).
    let seed = 7;
    const next = () => (seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31 - 0.5;
    const grid = Array.from({ length: 4 }, (_, a) =>
      Array.from({ length: 12 }, (_, p) => Array.from({ length: 4 }, () => p * 0.3 + a * 0.05 + next() * 0.1)),
    );
    const r = anovaGaugeStudy(grid);
    const ls = leastSquaresSS(grid);
    expect(r.table.map((x) => x.ss)).toEqual([ls.a, ls.p, ls.ap, ls.e, ls.t].map((v) => expect.closeTo(v, 8)));
    expect(r.table.map((x) => x.df)).toEqual([3, 11, 33, 144, 191]);
  });
  it('when every appraiser repeats each part exactly, then repeatability is 0 and the F tests have no denominator', () => {
    const grid = [
      [
        [1, 1],
        [2, 2],
      ],
      [
        [1.1, 1.1],
        [2.3, 2.3],
      ],
    ];
    const r = anovaGaugeStudy(grid);
    expect(rowOf(r.table, 'interaction')).toMatchObject({ f: null, p: 0 });
    expect(r.pooled).toBe(false);
    expect(r.variance.ev).toBe(0);
  });
  it('when the pooling threshold is not a probability, then it refuses', () => {
    expect(() => anovaGaugeStudy(AIAG_READINGS, { poolAbove: 2 })).toThrow('between 0 and 1');
  });
});
