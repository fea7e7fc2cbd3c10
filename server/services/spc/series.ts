import {
  individualsChart,
  partMeansChart,
  xbarRChart,
  xbarSChart,
  type BaselineRange,
  type ChartLimits,
  type ControlChart,
  type Subgroup,
} from '../../../shared/domain/spc/index.js';
import { MAX_RANGE_SUBGROUP } from '../../../shared/domain/spc/constants.js';
import type { ChartMethod, ChartMethodChoice } from '../../../shared/schemas/spc.js';
import { invalid } from '../../errors.js';
import type { PartReadings } from './readings.js';

/**
 * Readings grouped into chart points. A characteristic read at several positions on a part (a
 * block's bores) is charted as part means with the spread within each part on its own chart, or as
 * X̄–R / X̄–S with the part's positions as the subgroup. A characteristic read once per part is
 * charted as individuals, or as X̄–R / X̄–S over subgroups of consecutive parts.
 */
export type Series = {
  method: ChartMethod;
  /** Readings per point. */
  n: number;
  /** Consecutive parts per subgroup (one reading per part, X̄ charts); null when a point is one part. */
  partsPerPoint: number | null;
  subgroups: Subgroup[];
  /** The part each point stands for (the last of its subgroup). */
  points: PartReadings[];
  /** Parts used, in order. */
  parts: PartReadings[];
  /** Parts left out because they lack positions the others have. */
  incomplete: number;
  /** Parts after the last whole subgroup of consecutive parts. */
  leftOver: number;
};

export const DEFAULT_PARTS_PER_SUBGROUP = 5;

/** Every reading of the parts, in order: one array filled in a loop (flatMap is slow at 240,000). */
export function allValues(parts: readonly PartReadings[]): number[] {
  let total = 0;
  for (const p of parts) total += p.values.length;
  const out = new Array<number>(total);
  let k = 0;
  for (const p of parts) for (const v of p.values) out[k++] = v;
  return out;
}

/** The usual number of readings per part; ties go to the larger (a complete part). */
function modalCount(parts: PartReadings[]): number {
  const counts = new Map<number, number>();
  for (const p of parts) counts.set(p.values.length, (counts.get(p.values.length) ?? 0) + 1);
  let best = 0;
  let seen = 0;
  for (const [n, c] of counts) if (c > seen || (c === seen && n > best)) [best, seen] = [n, c];
  return best;
}

export function buildSeries(all: PartReadings[], choice: ChartMethodChoice, subgroup?: number): Series {
  const n0 = modalCount(all);
  const parts = all.filter((p) => p.values.length === n0);
  const method: ChartMethod = choice === 'auto' ? (n0 > 1 ? 'part-means' : 'i-mr') : choice;
  const many = n0 > 1;
  if (method === 'i-mr' && many) {
    throw invalid(`Each part has ${n0} readings of this: chart part means, or X̄–R / X̄–S over each part's positions.`, {
      chart: 'Individuals are for one reading per part.',
    });
  }
  if (method === 'part-means' && n0 === 1) {
    throw invalid('Each part has one reading of this: chart individuals, or X̄–R / X̄–S over consecutive parts.', {
      chart: 'Part means need several readings per part.',
    });
  }
  if (subgroup !== undefined && (many || method === 'i-mr' || method === 'part-means')) {
    throw invalid('Subgroups of consecutive parts are for an X̄ chart of a characteristic read once per part.', {
      subgroup: 'Leave this out for this chart.',
    });
  }
  let subgroups: Subgroup[];
  let points: PartReadings[];
  let partsPerPoint: number | null = null;
  let leftOver = 0;
  if ((method === 'xbar-r' || method === 'xbar-s') && n0 === 1) {
    partsPerPoint = subgroup ?? DEFAULT_PARTS_PER_SUBGROUP;
    const whole = Math.floor(parts.length / partsPerPoint);
    leftOver = parts.length - whole * partsPerPoint;
    subgroups = [];
    points = [];
    for (let g = 0; g < whole; g++) {
      const chunk = parts.slice(g * partsPerPoint, (g + 1) * partsPerPoint);
      subgroups.push({ key: String(chunk.at(-1)!.resultId), values: chunk.map((p) => p.values[0]!) });
      points.push(chunk.at(-1)!);
    }
  } else {
    subgroups = parts.map((p) => ({ key: String(p.resultId), values: p.values }));
    points = parts;
  }
  const size = partsPerPoint ?? n0;
  if (method === 'xbar-r' && size > MAX_RANGE_SUBGROUP) {
    throw invalid(`X̄–R takes subgroups of at most ${MAX_RANGE_SUBGROUP} readings; these have ${size}. Use X̄–S.`, {
      chart: 'Choose X̄–S for subgroups this large.',
    });
  }
  return {
    method,
    n: size,
    partsPerPoint,
    subgroups,
    points,
    parts,
    incomplete: all.length - parts.length,
    leftOver,
  };
}

export type Computed = { limits: ChartLimits; sigmaWithin: number; charts: ControlChart[] };

/**
 * The shared chart functions on a series: limits from the baseline (every point when none), or the
 * frozen ones applied unchanged. Their RangeErrors (too few points, limits for another chart) are
 * the request's problem, answered with a 400.
 */
export function computeChart(s: Series, opts: { limits?: ChartLimits; baseline?: BaselineRange } = {}): Computed {
  try {
    switch (s.method) {
      case 'part-means': {
        const c = partMeansChart(s.subgroups, opts as never);
        return { limits: c.limits, sigmaWithin: c.sigmaWithin, charts: [c.means, c.movingRange, c.within] };
      }
      case 'xbar-r': {
        const c = xbarRChart(s.subgroups, opts as never);
        return { limits: c.limits, sigmaWithin: c.sigmaWithin, charts: [c.xbar, c.range] };
      }
      case 'xbar-s': {
        const c = xbarSChart(s.subgroups, opts as never);
        return { limits: c.limits, sigmaWithin: c.sigmaWithin, charts: [c.xbar, c.s] };
      }
      case 'i-mr': {
        const points = s.subgroups.map((g) => ({ key: g.key, value: g.values[0]! }));
        const c = individualsChart(points, opts as never);
        return { limits: c.limits, sigmaWithin: c.sigmaWithin, charts: [c.individuals, c.movingRange] };
      }
    }
  } catch (err) {
    if (err instanceof RangeError) throw invalid(`No chart can be drawn: ${err.message}.`);
    throw err;
  }
}

/** Whether frozen limits fit a series: same chart, same readings per point, one part per point. */
export function limitsFit(limits: ChartLimits, s: Series): boolean {
  if (limits.method !== s.method || s.partsPerPoint !== null) return false;
  return !('n' in limits) || limits.n === s.n;
}

/** The centre line and control limits of the location chart the limits draw (through the chart code itself). */
export function linesOf(limits: ChartLimits): { centre: number; lower: number; upper: number; sigmaWithin: number } {
  const n = 'n' in limits ? limits.n : 1;
  const s: Series = {
    method: limits.method,
    n,
    partsPerPoint: null,
    subgroups: [0, 1].map((i) => ({ key: String(i), values: Array.from({ length: n }, () => 0) })),
    points: [],
    parts: [],
    incomplete: 0,
    leftOver: 0,
  };
  const c = computeChart(s, { limits });
  const loc = c.charts[0]!;
  return { centre: loc.centre, lower: loc.lower, upper: loc.upper, sigmaWithin: c.sigmaWithin };
}
