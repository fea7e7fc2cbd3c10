import { StudyDataError } from './study-error.js';

/**
 * Two-parameter Weibull analysis of time to failure with suspensions (units still running, or
 * removed for another reason): F(t) = 1 − exp(−(t/η)^β), shape β, scale η (the time by which
 * 63.2 % have failed).
 *
 * Plotting positions: Johnson's adjusted ranks (L. G. Johnson, The Statistical Treatment of
 * Fatigue Experiments, 1964) turned into median ranks by Bernard's approximation (i − 0.3)/(n + 0.4).
 * Median-rank regression puts ln t on ln(−ln(1 − F)) — X on Y, the way R. B. Abernethy's The New
 * Weibull Handbook recommends (time is the variable with the scatter) — unless Y on X is asked for.
 * Maximum likelihood is in weibull-mle.ts.
 */

/** One unit, or `count` identical ones: its time (in service, on test) and whether it failed then. */
export type LifeRecord = { time: number; failed: boolean; count?: number };

export type WeibullParameters = { shape: number; scale: number };

/** A failure's place on the probability plot. */
export type PlotPoint = {
  time: number;
  /** Johnson's adjusted rank (a whole number when nothing was suspended before it). */
  adjustedRank: number;
  /** Bernard's median rank: the estimated fraction failed by this time. */
  medianRank: number;
  /** ln t. */
  x: number;
  /** ln(−ln(1 − F)). */
  y: number;
};

export type Regression = 'x-on-y' | 'y-on-x';

export type RegressionFit = WeibullParameters & {
  method: 'median-rank-regression';
  regression: Regression;
  /** Square of the correlation between x and y of the plotted failures. */
  rSquared: number;
  failures: number;
  suspensions: number;
  points: PlotPoint[];
};

/** Checks the records and sorts them: by time, failures before suspensions at the same time. */
export function sortedRecords(records: readonly LifeRecord[]): Required<LifeRecord>[] {
  const out = records.map((r, i) => {
    if (!(typeof r.time === 'number' && Number.isFinite(r.time) && r.time > 0)) {
      throw new StudyDataError(`record ${i + 1}: the time must be a number greater than zero`, 'records');
    }
    if (typeof r.failed !== 'boolean') {
      throw new StudyDataError(
        `record ${i + 1}: say whether the unit failed (true) or is still running (false)`,
        'records',
      );
    }
    const count = r.count ?? 1;
    if (!(Number.isInteger(count) && count >= 1)) {
      throw new StudyDataError(`record ${i + 1}: the count must be a whole number of at least 1`, 'records');
    }
    return { time: r.time, failed: r.failed, count };
  });
  // At a tie the failure is taken as first: a unit suspended at t is known to have lasted to t
  // (common practice; the order Abernethy's handbook uses, from memory).
  return out.sort((a, b) => a.time - b.time || Number(b.failed) - Number(a.failed));
}

export function countOf(records: readonly Required<LifeRecord>[]) {
  let failures = 0;
  let total = 0;
  for (const r of records) {
    total += r.count;
    if (r.failed) failures += r.count;
  }
  return { failures, suspensions: total - failures, total };
}

/** Bernard's approximation to the median rank of the j-th of n: (j − 0.3)/(n + 0.4). */
export function bernard(rank: number, n: number): number {
  return (rank - 0.3) / (n + 0.4);
}

/** The plot coordinates of a time and a fraction failed. */
export function plotCoordinates(time: number, fractionFailed: number): { x: number; y: number } {
  return { x: Math.log(time), y: Math.log(-Math.log(1 - fractionFailed)) };
}

/**
 * One point per failure. Johnson: each failure's rank is the previous one plus (n + 1 − previous)
 * / (1 + units from this one on), written here as (reverse rank × previous + n + 1)/(reverse
 * rank + 1), so a suspension only shifts the ranks of the failures after it.
 */
export function probabilityPlot(records: readonly LifeRecord[]): PlotPoint[] {
  return plotSorted(sortedRecords(records));
}

function plotSorted(sorted: readonly Required<LifeRecord>[]): PlotPoint[] {
  const n = countOf(sorted).total;
  const points: PlotPoint[] = [];
  let position = 0;
  let previous = 0;
  for (const r of sorted) {
    for (let k = 0; k < r.count; k++) {
      position++;
      if (!r.failed) continue;
      const reverseRank = n - position + 1;
      previous = (reverseRank * previous + n + 1) / (reverseRank + 1);
      const medianRank = bernard(previous, n);
      points.push({ time: r.time, adjustedRank: previous, medianRank, ...plotCoordinates(r.time, medianRank) });
    }
  }
  return points;
}

/** Least-squares Weibull fit to the probability plot. */
export function medianRankRegression(
  records: readonly LifeRecord[],
  options: { regression?: Regression } = {},
): RegressionFit {
  const regression = options.regression ?? 'x-on-y';
  const sorted = sortedRecords(records);
  const counts = countOf(sorted);
  const points = plotSorted(sorted);
  if (points.length < 2) throw new StudyDataError('a Weibull fit needs at least 2 failures', 'records');
  const m = points.length;
  const xBar = points.reduce((s, p) => s + p.x, 0) / m;
  const yBar = points.reduce((s, p) => s + p.y, 0) / m;
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  for (const p of points) {
    sxx += (p.x - xBar) ** 2;
    syy += (p.y - yBar) ** 2;
    sxy += (p.x - xBar) * (p.y - yBar);
  }
  if (!(sxx > 0 && sxy > 0)) {
    throw new StudyDataError('all failures are at one time, so the data do not give a shape', 'records');
  }
  // x = ln η + y/β (X on Y) or y = β x − β ln η (Y on X).
  const shape = regression === 'x-on-y' ? syy / sxy : sxy / sxx;
  const scale = Math.exp(xBar - yBar / shape);
  return {
    shape,
    scale,
    method: 'median-rank-regression',
    regression,
    rSquared: (sxy * sxy) / (sxx * syy),
    failures: counts.failures,
    suspensions: counts.suspensions,
    points,
  };
}

function checkParameters({ shape, scale }: WeibullParameters) {
  if (!(shape > 0 && scale > 0 && Number.isFinite(shape) && Number.isFinite(scale))) {
    throw new StudyDataError('a Weibull distribution needs a positive shape and scale');
  }
}

/** F(t): the fraction expected to have failed by time t. */
export function weibullCdf(t: number, params: WeibullParameters): number {
  checkParameters(params);
  return t <= 0 ? 0 : -Math.expm1(-((t / params.scale) ** params.shape));
}

/** Bp life: the time by which the fraction p (0.10 for B10) is expected to have failed. */
export function bLife(p: number, params: WeibullParameters): number {
  checkParameters(params);
  if (!(p > 0 && p < 1)) throw new StudyDataError('the B-life fraction lies between 0 and 1 (0.10 for B10)');
  return params.scale * (-Math.log1p(-p)) ** (1 / params.shape);
}

/** Points of the fitted line on the probability plot, for a chart: `steps` + 1 times, evenly in ln t. */
export function fittedLine(
  params: WeibullParameters,
  from: number,
  to: number,
  steps = 50,
): { time: number; fractionFailed: number; x: number; y: number }[] {
  checkParameters(params);
  if (!(from > 0 && to > from)) throw new StudyDataError('the line needs 0 < from < to');
  const [a, b] = [Math.log(from), Math.log(to)];
  return Array.from({ length: steps + 1 }, (_, i) => {
    const x = a + ((b - a) * i) / steps;
    // On this plot the fitted distribution is the straight line y = β (x − ln η).
    const y = params.shape * (x - Math.log(params.scale));
    return { time: Math.exp(x), fractionFailed: -Math.expm1(-Math.exp(y)), x, y };
  });
}
