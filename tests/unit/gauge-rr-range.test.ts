import { jStat } from 'jstat';
import { describe, expect, it } from 'vitest';
import { bandOf, verdictOf } from '../../shared/domain/gauge-study.js';
import { A2, D4, K1, K2, K3, averageAndRange } from '../../shared/domain/gauge-rr-range.js';
import { StudyDataError } from '../../shared/domain/study-error.js';
import { AIAG_READINGS } from './fixtures/msa-aiag.js';

describe('the AIAG MSA 4th edition study by average and range', () => {
  // Expected figures: the manual's own worked example (AIAG MSA 4th ed., average-and-range data
  // sheet and report; from memory). The manual rounds its intermediates (R̄̄ 0.3417, X̄diff
  // 0.4446, Rp 3.511) before multiplying, so its σ figures differ from full precision in the
  // fifth decimal; the checks allow for that and no more.
  const r = averageAndRange(AIAG_READINGS);

  it('when the grid is summarised, then R̄̄ = 0.3417, X̄diff = 0.4446, Rp = 3.511', () => {
    expect(r.rBarBar).toBeCloseTo(0.3417, 4);
    expect(r.xBarDiff).toBeCloseTo(0.4446, 3); // 0.44467 in full; the manual subtracts rounded means
    expect(r.partRange).toBeCloseTo(3.511, 3);
    expect(r.means.appraiser.map((x) => +x.toFixed(4))).toEqual([0.1903, 0.0683, -0.2543]);
  });
  it('when the components are computed, then EV 0.20188, AV 0.22963, GRR 0.30575, PV 1.10456, TV 1.14610', () => {
    expect(r.sigma.ev).toBeCloseTo(0.20188, 4);
    expect(r.sigma.av).toBeCloseTo(0.22963, 4);
    expect(r.sigma.grr).toBeCloseTo(0.30575, 4);
    expect(r.sigma.pv).toBeCloseTo(1.10456, 4);
    expect(r.sigma.tv).toBeCloseTo(1.1461, 4);
    expect(r.sigma.interaction).toBe(0); // the range method cannot see an interaction
  });
  it('when expressed against total variation, then %EV 17.6, %AV 20.0, %GRR 26.7, %PV 96.4 and ndc 5', () => {
    expect(r.percentOfTotal.ev).toBeCloseTo(17.6, 1);
    expect(r.percentOfTotal.av).toBeCloseTo(20.0, 1);
    expect(r.percentOfTotal.grr).toBeCloseTo(26.7, 1);
    expect(r.percentOfTotal.pv).toBeCloseTo(96.4, 1);
    expect(r.ndcRaw).toBeCloseTo(5.09, 2); // 1.41 × 1.10456 / 0.30575 = 5.094
    expect(r.ndc).toBe(5);
  });
  it('when judged, then %GRR 26.7 is conditional and ndc 5 is enough (AIAG guidelines)', () => {
    expect(r.bands).toEqual({ total: 'conditional', tolerance: null, ndcAdequate: true });
    expect(r.verdict).toBe('conditional');
  });
  it('when the ranges are charted, then appraiser B on part 4 (range 1.02) is above UCL_R = D4 × R̄̄ ≈ 0.88', () => {
    // The manual's example flags the same cell (from memory) and goes on with the study.
    expect(r.uclR).toBeCloseTo(0.8795, 3);
    expect(r.rangesAboveUcl).toEqual([{ appraiser: 1, part: 3, range: expect.closeTo(1.02, 10) }]);
  });
  it('when the averages are charted, then most cell means fall outside X̄̄ ± A2 R̄̄ (the gauge tells parts apart)', () => {
    expect(r.averageChart.fractionOutside).toBeCloseTo(22 / 30, 10); // counted from the data
  });
  it('when a tolerance of 6.0 is given, then %GRR of tolerance = 100 × 6 × GRR / 6.0 (4th ed. 6σ)', () => {
    const t = averageAndRange(AIAG_READINGS, { tolerance: 6 });
    expect(t.percentOfTolerance!.grr).toBeCloseTo(100 * t.sigma.grr, 10); // derived: 6σ / 6.0
    expect(t.percentOfTolerance!.grr).toBeCloseTo(30.58, 2);
    expect(t.bands.tolerance).toBe('unacceptable');
    expect(t.verdict).toBe('unacceptable'); // a tolerance given: judged by it
  });
  it('when the 3rd edition spread 5.15σ is asked for, then only %tolerance changes', () => {
    const t = averageAndRange(AIAG_READINGS, { tolerance: 6, studySpread: 5.15 });
    expect(t.percentOfTolerance!.grr).toBeCloseTo((100 * 5.15 * t.sigma.grr) / 6, 10);
    expect(t.percentOfTotal.grr).toBeCloseTo(r.percentOfTotal.grr, 12);
  });
});

describe('a 2 appraiser × 2 part × 2 trial study worked by hand', () => {
  // A: part 1 10.0, 10.2; part 2 12.0, 12.4. B: part 1 10.4, 10.4; part 2 12.2, 12.6.
  // R̄_A = (0.2 + 0.4)/2 = 0.3, R̄_B = (0 + 0.4)/2 = 0.2, R̄̄ = 0.25 → EV = 0.25 × 0.8862 = 0.22155.
  // X̄_A = 11.15, X̄_B = 11.40 → X̄diff = 0.25; AV² = (0.25 × 0.7071)² − 0.22155²/(2 × 2)
  //   = 0.031249 − 0.012271 = 0.018978 → AV = 0.13776.
  // Part means 10.25 and 12.30 → Rp = 2.05, PV = 2.05 × 0.7071 = 1.449555.
  // GRR = √(0.049084 + 0.018978) = 0.26089; TV = √(0.068062 + 2.101210) = 1.472845.
  // %GRR = 17.71; ndc = 1.41 × 1.44956 / 0.26089 = 7.83 → 7.
  const grid = [
    [
      [10.0, 10.2],
      [12.0, 12.4],
    ],
    [
      [10.4, 10.4],
      [12.2, 12.6],
    ],
  ];
  it('when computed, then it gives the hand-worked figures', () => {
    const r = averageAndRange(grid);
    expect(r.constants).toMatchObject({ k1: 0.8862, k2: 0.7071, k3: 0.7071 });
    expect(r.sigma.ev).toBeCloseTo(0.22155, 5);
    expect(r.sigma.av).toBeCloseTo(0.13776, 5);
    expect(r.sigma.pv).toBeCloseTo(1.449555, 6);
    expect(r.sigma.grr).toBeCloseTo(0.26089, 5);
    expect(r.sigma.tv).toBeCloseTo(1.472845, 6);
    expect(r.percentOfTotal.grr).toBeCloseTo(17.71, 2);
    expect(r.ndc).toBe(7);
  });
  it('when the appraisers agree more closely than repeatability explains, then AV is 0, not imaginary', () => {
    const close = [grid[0]!, grid[0]!.map((ts) => ts.map((x) => x + 0.01))];
    const r = averageAndRange(close);
    expect(r.sigma.av).toBe(0); // (0.01 × 0.7071)² < EV²/4
    expect(r.sigma.grr).toBeCloseTo(r.sigma.ev, 12);
  });
});

describe('the K factors, recomputed from the distribution of the range of normal samples', () => {
  // K1 = 1/d2(m): the mean range of m normal readings, many ranges. K2 and K3 = 1/d2*(m) for a
  // single range, d2* = √E[R²] (Duncan's d2* for g = 1). Both integrals are taken numerically
  // with jstat's normal distribution, independent of the tables, and must give the AIAG 4th ed.
  // figures (from memory) to their four printed decimals. Three of them are also printed on
  // gagerandr.com's "Variable R&R (X̄ & R)" worksheet: K1 0.5908 (3 trials), K2 0.5231 (3
  // appraisers), K3 0.3146 (10 parts).
  const h = 0.02;
  const xs = Array.from({ length: Math.round(16 / h) }, (_, i) => -8 + h / 2 + i * h);
  const Phi = xs.map((x) => jStat.normal.cdf(x, 0, 1));
  const phi = xs.map((x) => jStat.normal.pdf(x, 0, 1));
  const d2 = (m: number) => Phi.reduce((s, F) => s + (1 - F ** m - (1 - F) ** m) * h, 0);
  const d2Star = (m: number) => {
    let sum = 0;
    for (let i = 0; i < xs.length; i++) {
      for (let j = i + 1; j < xs.length; j++) {
        sum += (xs[j]! - xs[i]!) ** 2 * phi[i]! * phi[j]! * (Phi[j]! - Phi[i]!) ** (m - 2);
      }
    }
    return Math.sqrt(m * (m - 1) * h * h * sum);
  };

  it('when d2 is integrated, then it matches the X̄/R chart table (d2(2) = 1.128, d2(3) = 1.693; ASTM E2587 table, e-Handbook §6.3.2)', () => {
    expect(d2(2)).toBeCloseTo(2 / Math.sqrt(Math.PI), 6); // exact: 2/√π
    expect(d2(3)).toBeCloseTo(3 / Math.sqrt(Math.PI), 6); // exact: 3/√π
    expect(d2(10)).toBeCloseTo(3.078, 3);
  });
  it('when K1 = 1/d2 for 2 and 3 trials, then 0.8862 and 0.5908', () => {
    for (const m of [2, 3]) expect(1 / d2(m)).toBeCloseTo(K1[m]!, 4);
  });
  it('when K2 and K3 = 1/d2* for one range, then every tabled figure from 2 to 10 agrees', () => {
    for (const m of [2, 3]) expect(1 / d2Star(m)).toBeCloseTo(K2[m]!, 4);
    for (let m = 2; m <= 10; m++) expect(1 / d2Star(m)).toBeCloseTo(K3[m]!, 4);
    expect(Object.keys(K3)).toHaveLength(9);
  });
  it('when D4 and A2 are used for the charts, then they are the ASTM E2587 table figures (±0.001)', () => {
    expect(D4[2]).toBeCloseTo(3.267, 3);
    expect(D4[3]).toBeCloseTo(2.575, 2);
    expect(A2[2]).toBeCloseTo(1.88, 3);
    expect(A2[3]).toBeCloseTo(1.023, 3);
  });
});

describe('acceptance bands (AIAG MSA 4th ed. guidelines, from memory)', () => {
  it('when %GRR is just under 10, at 10, at 30 and just over 30, then acceptable, conditional, conditional, unacceptable', () => {
    expect(bandOf(9.99)).toBe('acceptable');
    expect(bandOf(10)).toBe('conditional');
    expect(bandOf(30)).toBe('conditional');
    expect(bandOf(30.01)).toBe('unacceptable');
  });
  it('when there is no tolerance and ndc is below 5, then the study is unacceptable whatever %GRR says', () => {
    expect(verdictOf({ total: 'acceptable', tolerance: null, ndcAdequate: false })).toBe('unacceptable');
    expect(verdictOf({ total: 'conditional', tolerance: null, ndcAdequate: true })).toBe('conditional');
  });
  it('when a tolerance is given, then the tolerance band decides', () => {
    expect(verdictOf({ total: 'unacceptable', tolerance: 'acceptable', ndcAdequate: false })).toBe('acceptable');
  });
});

describe('bad grids are refused with a message for the person who entered them', () => {
  const ok = AIAG_READINGS;
  it('when an appraiser is missing a part, then it names the appraiser', () => {
    const ragged = [ok[0]!, ok[1]!.slice(0, 9), ok[2]!];
    expect(() => averageAndRange(ragged)).toThrow(StudyDataError);
    expect(() => averageAndRange(ragged)).toThrow('appraiser 2 measured 9 parts, not 10');
  });
  it('when a reading is missing or not a number, then it names the cell', () => {
    const holed = ok.map((ps, a) => ps.map((ts, p) => ts.map((x, t) => (a === 2 && p === 4 && t === 1 ? NaN : x))));
    expect(() => averageAndRange(holed)).toThrow('appraiser 3, part 5, trial 2 is not a number');
    const short = ok.map((ps, a) => ps.map((ts, p) => (a === 0 && p === 0 ? ts.slice(0, 2) : ts)));
    expect(() => averageAndRange(short)).toThrow('appraiser 1, part 1 has 2 trials, not 3');
  });
  it('when the study is too small or outside the tabled K factors, then it says what to do', () => {
    expect(() => averageAndRange([ok[0]!])).toThrow('at least 2 appraisers');
    const fourTrials = ok.map((ps) => ps.map((ts) => [...ts, ts[0]!]));
    expect(() => averageAndRange(fourTrials)).toThrow('2 or 3 trials; use the ANOVA method');
    const elevenParts = ok.map((ps) => [...ps, ps[0]!]);
    expect(() => averageAndRange(elevenParts)).toThrow('2 to 10 parts; use the ANOVA method');
  });
  it('when every reading is the same, then there is nothing to judge', () => {
    const flat = ok.map((ps) => ps.map((ts) => ts.map(() => 1)));
    expect(() => averageAndRange(flat)).toThrow('shows no variation');
  });
  it('when the tolerance is not positive or the spread is not 6 or 5.15, then it refuses', () => {
    expect(() => averageAndRange(ok, { tolerance: 0 })).toThrow('tolerance must be a positive number');
    expect(() => averageAndRange(ok, { studySpread: 4 as 6 })).toThrow('6 (4th edition) or 5.15');
  });
});
