import { rangeConstants, sConstants } from './constants.js';
import {
  baselineSlice,
  individualsLimits,
  partMeansLimits,
  sigmaWithin,
  subgroupSize,
  withinPartSigma,
  xbarRLimits,
  xbarSLimits,
  type BaselineRange,
  type ChartLimits,
  type Individual,
  type IndividualsLimits,
  type PartMeansLimits,
  type Subgroup,
  type XbarRLimits,
  type XbarSLimits,
} from './limits.js';
import { runRuleFlags, RUN_RULES, type RunRule } from './run-rules.js';
import { mean, movingRanges, range, requireFinite, sampleSd } from './summary.js';

/**
 * Control charts: limits (computed from a baseline, or frozen ones passed in) applied to every
 * point, each point flagged with the run rules it breaks. The location chart (X̄, individuals,
 * part means) is checked against the rules asked for; the spread charts (R, s, moving range,
 * within-part spread) against rule 1 only, because their zones are not symmetric about the centre.
 */

export type ChartKind =
  | 'xbar'
  | 'range'
  | 's'
  | 'individuals'
  | 'moving-range'
  | 'part-mean'
  | 'part-moving-range'
  | 'within-range'
  | 'within-s';

export type ChartPoint = {
  /** Place on the chart's horizontal axis; a moving range sits under the later of its two readings. */
  index: number;
  key: string;
  value: number;
  inBaseline: boolean;
  flags: RunRule[];
};

export type Signal = { index: number; key: string; rule: RunRule };

export type ControlChart = {
  kind: ChartKind;
  centre: number;
  lower: number;
  upper: number;
  /** σ of the plotted statistic: the width of one zone. */
  sigma: number;
  rules: RunRule[];
  points: ChartPoint[];
  signals: Signal[];
};

export type ChartOptions<L extends ChartLimits> = {
  /** Points whose statistics set the limits (ignored for the limits when `limits` is given). */
  baseline?: BaselineRange;
  /** Frozen limits to apply instead of computing them. */
  limits?: L;
  /** Run rules for the location chart; all four by default. */
  rules?: readonly RunRule[];
};

type Lines = { centre: number; lower: number; upper: number; sigma: number };
type Stat = { index: number; key: string; value: number; inBaseline: boolean };

function chart(kind: ChartKind, lines: Lines, stats: Stat[], rules: readonly RunRule[]): ControlChart {
  // frozen limits come back from storage: a missing or broken figure must not draw a chart of NaNs
  if (!Object.values(lines).every(Number.isFinite))
    throw new RangeError('the limits hold a figure that is not a number');
  const flags = runRuleFlags(
    stats.map((s) => s.value),
    lines,
    rules,
  );
  // an explicit literal: spreading 300 000 objects here cost seconds
  const points = stats.map((s, i) => ({
    index: s.index,
    key: s.key,
    value: s.value,
    inBaseline: s.inBaseline,
    flags: flags[i]!,
  }));
  const signals = points.flatMap((p) => p.flags.map((rule) => ({ index: p.index, key: p.key, rule })));
  return { kind, ...lines, rules: [...rules], points, signals };
}

function inBaselineTest(count: number, opts: ChartOptions<ChartLimits>): (i: number) => boolean {
  if (opts.baseline) {
    baselineSlice(Array.from({ length: count }), opts.baseline); // validates the range
    const { from, to } = opts.baseline;
    return (i) => i >= from && i <= to;
  }
  return () => !opts.limits; // limits computed from every point, or none of them are the baseline
}

function frozenFor<L extends ChartLimits>(limits: L, method: L['method'], n?: number): L {
  if (limits.method !== method) throw new RangeError(`these limits are for a ${limits.method} chart`);
  if (n !== undefined && 'n' in limits && limits.n !== n) {
    throw new RangeError(`these limits are for subgroups of ${limits.n}, not ${n}`);
  }
  return limits;
}

function subgroupStats(
  subgroups: readonly Subgroup[],
  f: (v: readonly number[]) => number,
  inBase: (i: number) => boolean,
) {
  return subgroups.map((s, i) => ({ index: i, key: s.key, value: f(s.values), inBaseline: inBase(i) }));
}

function movingRangeStats(stats: Stat[]): Stat[] {
  return movingRanges(stats.map((s) => s.value)).map((value, j) => {
    const later = stats[j + 1]!;
    return { index: later.index, key: later.key, value, inBaseline: later.inBaseline && stats[j]!.inBaseline };
  });
}

const SPREAD_RULES: readonly RunRule[] = [1];

export type XbarRChart = { limits: XbarRLimits; sigmaWithin: number; xbar: ControlChart; range: ControlChart };

/** X̄–R: x̿ ± A2·R̄; R between D3·R̄ and D4·R̄ (e-Handbook §6.3.2.1). */
export function xbarRChart(subgroups: readonly Subgroup[], opts: ChartOptions<XbarRLimits> = {}): XbarRChart {
  const n = subgroupSize(subgroups);
  const limits = opts.limits ? frozenFor(opts.limits, 'xbar-r', n) : xbarRLimits(subgroups, opts.baseline);
  const k = rangeConstants(n);
  const inBase = inBaselineTest(subgroups.length, opts);
  const { grandMean: x, rBar: r } = limits;
  return {
    limits,
    sigmaWithin: sigmaWithin(limits),
    xbar: chart(
      'xbar',
      { centre: x, lower: x - k.A2 * r, upper: x + k.A2 * r, sigma: (k.A2 * r) / 3 },
      subgroupStats(subgroups, mean, inBase),
      opts.rules ?? RUN_RULES,
    ),
    range: chart(
      'range',
      { centre: r, lower: k.D3 * r, upper: k.D4 * r, sigma: (k.d3 * r) / k.d2 },
      subgroupStats(subgroups, range, inBase),
      SPREAD_RULES,
    ),
  };
}

export type XbarSChart = { limits: XbarSLimits; sigmaWithin: number; xbar: ControlChart; s: ControlChart };

/** X̄–S: x̿ ± A3·s̄; s between B3·s̄ and B4·s̄ (e-Handbook §6.3.2.1), any subgroup size. */
export function xbarSChart(subgroups: readonly Subgroup[], opts: ChartOptions<XbarSLimits> = {}): XbarSChart {
  const n = subgroupSize(subgroups);
  const limits = opts.limits ? frozenFor(opts.limits, 'xbar-s', n) : xbarSLimits(subgroups, opts.baseline);
  const k = sConstants(n);
  const inBase = inBaselineTest(subgroups.length, opts);
  const { grandMean: x, sBar: s } = limits;
  return {
    limits,
    sigmaWithin: sigmaWithin(limits),
    xbar: chart(
      'xbar',
      { centre: x, lower: x - k.A3 * s, upper: x + k.A3 * s, sigma: (k.A3 * s) / 3 },
      subgroupStats(subgroups, mean, inBase),
      opts.rules ?? RUN_RULES,
    ),
    s: chart(
      's',
      { centre: s, lower: k.B3 * s, upper: k.B4 * s, sigma: (s * Math.sqrt(1 - k.c4 * k.c4)) / k.c4 },
      subgroupStats(subgroups, sampleSd, inBase),
      SPREAD_RULES,
    ),
  };
}

/** Lines of an individuals chart and its moving-range chart from x̄ and MR̄ (e-Handbook §6.3.2.2). */
function individualsLines(centre: number, mrBar: number): { x: Lines; mr: Lines } {
  const k = rangeConstants(2);
  const sigma = mrBar / k.d2;
  return {
    x: { centre, lower: centre - 3 * sigma, upper: centre + 3 * sigma, sigma },
    mr: { centre: mrBar, lower: k.D3 * mrBar, upper: k.D4 * mrBar, sigma: (k.d3 * mrBar) / k.d2 },
  };
}

export type IndividualsChart = {
  limits: IndividualsLimits;
  sigmaWithin: number;
  individuals: ControlChart;
  movingRange: ControlChart;
};

/** I–MR: x̄ ± 3·MR̄/1.128; moving range up to D4(2)·MR̄ = 3.267·MR̄. */
export function individualsChart(
  points: readonly Individual[],
  opts: ChartOptions<IndividualsLimits> = {},
): IndividualsChart {
  requireFinite(points.map((p) => p.value));
  const limits = opts.limits ? frozenFor(opts.limits, 'i-mr') : individualsLimits(points, opts.baseline);
  const lines = individualsLines(limits.mean, limits.mrBar);
  const inBase = inBaselineTest(points.length, opts);
  const stats = points.map((p, i) => ({ index: i, key: p.key, value: p.value, inBaseline: inBase(i) }));
  return {
    limits,
    sigmaWithin: sigmaWithin(limits),
    individuals: chart('individuals', lines.x, stats, opts.rules ?? RUN_RULES),
    movingRange: chart('moving-range', lines.mr, movingRangeStats(stats), SPREAD_RULES),
  };
}

/** Lines of a within-part spread chart: range (D3, D4) or s (B3, B4) around its mean w. */
function spreadLines(within: 'range' | 's', n: number, w: number): Lines {
  if (within === 'range') {
    const k = rangeConstants(n);
    return { centre: w, lower: k.D3 * w, upper: k.D4 * w, sigma: (k.d3 * w) / k.d2 };
  }
  const k = sConstants(n);
  return { centre: w, lower: k.B3 * w, upper: k.B4 * w, sigma: (w * Math.sqrt(1 - k.c4 * k.c4)) / k.c4 };
}

export type PartMeansChart = {
  limits: PartMeansLimits;
  /** σ of one reading, part-to-part variation included (see sigmaWithin in limits.ts). */
  sigmaWithin: number;
  /** σ of readings within one part. */
  sigmaWithinPart: number;
  means: ControlChart;
  movingRange: ControlChart;
  within: ControlChart;
};

/**
 * Part means as individuals, their moving range, and the within-part range (or s beyond 10
 * positions). Charting the positions of one part as an X̄ subgroup would set limits from the
 * within-part spread alone, far tighter than the part-to-part variation, and flag most parts.
 */
export function partMeansChart(parts: readonly Subgroup[], opts: ChartOptions<PartMeansLimits> = {}): PartMeansChart {
  const n = subgroupSize(parts);
  const limits = opts.limits ? frozenFor(opts.limits, 'part-means', n) : partMeansLimits(parts, opts.baseline);
  const lines = individualsLines(limits.mean, limits.mrBar);
  const inBase = inBaselineTest(parts.length, opts);
  const means = subgroupStats(parts, mean, inBase);
  return {
    limits,
    sigmaWithin: sigmaWithin(limits),
    sigmaWithinPart: withinPartSigma(limits),
    means: chart('part-mean', lines.x, means, opts.rules ?? RUN_RULES),
    movingRange: chart('part-moving-range', lines.mr, movingRangeStats(means), SPREAD_RULES),
    within: chart(
      limits.within === 'range' ? 'within-range' : 'within-s',
      spreadLines(limits.within, n, limits.withinBar),
      subgroupStats(parts, limits.within === 'range' ? range : sampleSd, inBase),
      SPREAD_RULES,
    ),
  };
}
