import {
  type GaugeStudyGrid,
  type GaugeStudyOptions,
  type GrrFigures,
  type StudyMeans,
  type StudyShape,
  grrFigures,
  studyMeans,
  studyShape,
} from './gauge-study.js';
import { StudyDataError } from './study-error.js';

/**
 * Variable gauge R&R by the average-and-range method, AIAG MSA 4th edition (2010).
 *
 * The K factors are the 4th edition's: 1/d2* for one range (K2, K3) or for many ranges (K1), so
 * EV, AV, GRR, PV and TV come out as standard deviations. (The 3rd edition's 4.56 / 3.05 / 3.65 /
 * 2.70 folded 5.15σ into K; those are not used.) Each constant is checked in
 * tests/unit/gauge-rr-range.test.ts against the distribution of the range it comes from.
 */

/** K1 by number of trials: 1/d2 for ranges of that size (AIAG MSA 4th ed., from memory). */
export const K1: Readonly<Record<number, number>> = { 2: 0.8862, 3: 0.5908 };
/** K2 by number of appraisers: 1/d2* for one range (AIAG MSA 4th ed., from memory). */
export const K2: Readonly<Record<number, number>> = { 2: 0.7071, 3: 0.5231 };
/** K3 by number of parts: 1/d2* for one range (AIAG MSA 4th ed., from memory). */
export const K3: Readonly<Record<number, number>> = {
  2: 0.7071,
  3: 0.5231,
  4: 0.4467,
  5: 0.403,
  6: 0.3742,
  7: 0.3534,
  8: 0.3375,
  9: 0.3249,
  10: 0.3146,
};
/** D4 and A2 by subgroup size (trials), X̄/R chart constants (ASTM E2587, e-Handbook §6.3.2). */
export const D4: Readonly<Record<number, number>> = { 2: 3.267, 3: 2.574 };
export const A2: Readonly<Record<number, number>> = { 2: 1.88, 3: 1.023 };

export type RangeCell = { appraiser: number; part: number; range: number };

export type AverageRangeResult = GrrFigures & {
  method: 'average-range';
  shape: StudyShape;
  constants: { k1: number; k2: number; k3: number; d4: number; a2: number };
  means: StudyMeans;
  /** R̄ of each appraiser (mean of the part ranges). */
  appraiserRange: number[];
  rBarBar: number;
  /** Largest appraiser mean minus smallest. */
  xBarDiff: number;
  /** Largest part mean minus smallest (Rp). */
  partRange: number;
  /** D4 × R̄̄: a range above it points to a reading to repeat before the study is judged. */
  uclR: number;
  rangesAboveUcl: RangeCell[];
  /**
   * X̄ chart of the cell means against X̄̄ ± A2 R̄̄. A gauge that can tell parts apart puts about
   * half or more of the cell means outside these limits (AIAG MSA 4th ed., from memory).
   */
  averageChart: { centre: number; lcl: number; ucl: number; fractionOutside: number };
};

function constantsFor(shape: StudyShape) {
  const k1 = K1[shape.trials];
  const k2 = K2[shape.appraisers];
  const k3 = K3[shape.parts];
  if (k1 === undefined) {
    throw new StudyDataError('the average-and-range method takes 2 or 3 trials; use the ANOVA method', 'readings');
  }
  if (k2 === undefined) {
    throw new StudyDataError('the average-and-range method takes 2 or 3 appraisers; use the ANOVA method', 'readings');
  }
  if (k3 === undefined) {
    throw new StudyDataError('the average-and-range method takes 2 to 10 parts; use the ANOVA method', 'readings');
  }
  return { k1, k2, k3, d4: D4[shape.trials]!, a2: A2[shape.trials]! };
}

const spread = (xs: readonly number[]) => Math.max(...xs) - Math.min(...xs);
const mean = (xs: readonly number[]) => xs.reduce((s, x) => s + x, 0) / xs.length;

export function averageAndRange(readings: GaugeStudyGrid, options: GaugeStudyOptions = {}): AverageRangeResult {
  const shape = studyShape(readings);
  const constants = constantsFor(shape);
  const means = studyMeans(readings, shape);

  const appraiserRange = means.range.map(mean);
  const rBarBar = mean(appraiserRange);
  const xBarDiff = spread(means.appraiser);
  const partRange = spread(means.part);

  const ev = rBarBar * constants.k1;
  // Appraiser averages also carry repeatability; the manual subtracts its share, and a negative
  // result means the appraisers differ by no more than repeatability explains: AV = 0.
  const avSquared = (xBarDiff * constants.k2) ** 2 - ev ** 2 / (shape.parts * shape.trials);
  const pv = partRange * constants.k3;
  const figures = grrFigures({ ev: ev ** 2, av: Math.max(0, avSquared), interaction: 0, pv: pv ** 2 }, options);

  const uclR = constants.d4 * rBarBar;
  const rangesAboveUcl: RangeCell[] = [];
  means.range.forEach((row, a) =>
    row.forEach((range, p) => {
      if (range > uclR) rangesAboveUcl.push({ appraiser: a, part: p, range });
    }),
  );
  const cells = means.cell.flat();
  const lcl = means.grand - constants.a2 * rBarBar;
  const ucl = means.grand + constants.a2 * rBarBar;
  const outside = cells.filter((x) => x < lcl || x > ucl).length;

  return {
    ...figures,
    method: 'average-range',
    shape,
    constants,
    means,
    appraiserRange,
    rBarBar,
    xBarDiff,
    partRange,
    uclR,
    rangesAboveUcl,
    averageChart: { centre: means.grand, lcl, ucl, fractionOutside: outside / cells.length },
  };
}
