import { c4, MAX_RANGE_SUBGROUP, rangeConstants } from './constants.js';
import { mean, movingRanges, range, requireFinite, sampleSd } from './summary.js';

/**
 * Control limits computed from a baseline and then frozen.
 *
 * A limits object holds the baseline's statistics (grand mean, R̄, s̄ or MR̄, and the subgroup size),
 * not the drawn lines: the lines follow from them and the constants table, so a stored object
 * redraws the same chart later, and later points are judged against the baseline rather than
 * against limits that drift with them. Who froze the limits, when and why is the server's record.
 */

/** A subgroup of readings taken together (one time, one part, one sample). */
export type Subgroup = { key: string; values: readonly number[] };

/** One reading charted on its own. */
export type Individual = { key: string; value: number };

/** A baseline as inclusive indices into the charted points, in chart order. */
export type BaselineRange = { from: number; to: number };

export type XbarRLimits = { method: 'xbar-r'; n: number; baselineCount: number; grandMean: number; rBar: number };
export type XbarSLimits = { method: 'xbar-s'; n: number; baselineCount: number; grandMean: number; sBar: number };
export type IndividualsLimits = { method: 'i-mr'; baselineCount: number; mean: number; mrBar: number };
/**
 * Part means and within-part spread, for a characteristic read at n positions on each part: the
 * part means are charted as individuals (limits from their moving range), the spread within each
 * part on a chart of its own, as a range up to 10 positions and as a standard deviation beyond.
 */
export type PartMeansLimits = {
  method: 'part-means';
  n: number;
  baselineCount: number;
  mean: number;
  mrBar: number;
  within: 'range' | 's';
  withinBar: number;
};

export type ChartLimits = XbarRLimits | XbarSLimits | IndividualsLimits | PartMeansLimits;

/** The points a baseline covers; the whole series when none is chosen. */
export function baselineSlice<T>(points: readonly T[], baseline?: BaselineRange): T[] {
  if (!baseline) return [...points];
  const { from, to } = baseline;
  if (!Number.isInteger(from) || !Number.isInteger(to) || from < 0 || to < from || to >= points.length) {
    throw new RangeError(`the baseline must be a run of points between 0 and ${points.length - 1}`);
  }
  return points.slice(from, to + 1);
}

function needTwo(count: number, what: string) {
  if (count < 2) throw new RangeError(`the baseline needs at least two ${what}`);
}

/** The one subgroup size of a chart; charts with constant limits need equal subgroups. */
export function subgroupSize(subgroups: readonly Subgroup[]): number {
  const sizes = new Set(subgroups.map((s) => s.values.length));
  if (sizes.size > 1) throw new RangeError(`subgroups must all have the same size (found ${[...sizes].join(', ')})`);
  const n = sizes.values().next().value ?? 0;
  if (n < 2) throw new RangeError('a subgroup has at least 2 readings');
  for (const s of subgroups) requireFinite(s.values);
  return n;
}

/** X̄–R limits: centre x̿, R̄ (e-Handbook §6.3.2.1). */
export function xbarRLimits(subgroups: readonly Subgroup[], baseline?: BaselineRange): XbarRLimits {
  const n = subgroupSize(subgroups);
  rangeConstants(n); // refuses subgroups larger than the range table
  const base = baselineSlice(subgroups, baseline);
  needTwo(base.length, 'subgroups');
  return {
    method: 'xbar-r',
    n,
    baselineCount: base.length,
    grandMean: mean(base.map((s) => mean(s.values))),
    rBar: mean(base.map((s) => range(s.values))),
  };
}

/** X̄–S limits: centre x̿, s̄ (e-Handbook §6.3.2.1). */
export function xbarSLimits(subgroups: readonly Subgroup[], baseline?: BaselineRange): XbarSLimits {
  const n = subgroupSize(subgroups);
  const base = baselineSlice(subgroups, baseline);
  needTwo(base.length, 'subgroups');
  return {
    method: 'xbar-s',
    n,
    baselineCount: base.length,
    grandMean: mean(base.map((s) => mean(s.values))),
    sBar: mean(base.map((s) => sampleSd(s.values))),
  };
}

/** Individuals limits: x̄ and MR̄ of the baseline's consecutive pairs (e-Handbook §6.3.2.2). */
export function individualsLimits(points: readonly Individual[], baseline?: BaselineRange): IndividualsLimits {
  const values = points.map((p) => p.value);
  requireFinite(values);
  const base = baselineSlice(values, baseline);
  needTwo(base.length, 'readings');
  return { method: 'i-mr', baselineCount: base.length, mean: mean(base), mrBar: mean(movingRanges(base)) };
}

/** Part means and within-part spread limits; every part must be read at the same n positions. */
export function partMeansLimits(parts: readonly Subgroup[], baseline?: BaselineRange): PartMeansLimits {
  const n = subgroupSize(parts);
  const base = baselineSlice(parts, baseline);
  needTwo(base.length, 'parts');
  const means = base.map((p) => mean(p.values));
  const within = n <= MAX_RANGE_SUBGROUP ? 'range' : 's';
  const spread = within === 'range' ? range : sampleSd;
  return {
    method: 'part-means',
    n,
    baselineCount: base.length,
    mean: mean(means),
    mrBar: mean(movingRanges(means)),
    within,
    withinBar: mean(base.map((p) => spread(p.values))),
  };
}

/**
 * The σ of one reading that the limits imply, for Cp and Cpk: R̄/d2, s̄/c4 or MR̄/d2(2).
 *
 * For part means it adds the two parts of the variation: the part means' MR̄/d2 estimates
 * √(σ²between + σ²within/n), so one reading's σ is √(σ²means + σ²within·(1 − 1/n)). Using the
 * within-part σ alone would leave out the part-to-part variation and overstate capability.
 */
export function sigmaWithin(limits: ChartLimits): number {
  switch (limits.method) {
    case 'xbar-r':
      return limits.rBar / rangeConstants(limits.n).d2;
    case 'xbar-s':
      return limits.sBar / c4(limits.n);
    case 'i-mr':
      return limits.mrBar / rangeConstants(2).d2;
    case 'part-means': {
      const means = limits.mrBar / rangeConstants(2).d2;
      const within = withinPartSigma(limits);
      return Math.sqrt(means * means + within * within * (1 - 1 / limits.n));
    }
  }
}

/** The σ of readings within one part, from the within-part chart's centre line. */
export function withinPartSigma(limits: PartMeansLimits): number {
  return limits.within === 'range' ? limits.withinBar / rangeConstants(limits.n).d2 : limits.withinBar / c4(limits.n);
}
