import type { SpecLimits } from './capability.js';
import { requireFinite } from './summary.js';

/**
 * Histogram bins laid against the tolerance: every specification limit falls on a bin edge, so no
 * bin straddles a limit and each bin is wholly below, within or above the tolerance. A reading
 * exactly on a limit conforms (limits are inclusive, as in tolerance.ts), so it is counted in the
 * bin inside the tolerance. This is for showing readings; the verdict on a reading is judgeValue's.
 */

export type BinZone = 'below' | 'within' | 'above';
export type HistogramBin = { lower: number; upper: number; count: number; zone: BinZone };
export type Histogram = { n: number; width: number; spec: SpecLimits; bins: HistogramBin[] };

export type HistogramOptions = {
  /** Roughly how many bins across the data and limits; Sturges' rule (⌈log₂ n⌉ + 1) by default. */
  bins?: number;
  /** Never more bins than this, however far readings lie from the tolerance. */
  maxBins?: number;
};

const EDGE_EPS = 1e-9;

/** The smallest of 1, 2, 5 × 10ᵏ at least `raw`: widths a reader can add up in their head. */
function niceWidth(raw: number): number {
  const p = 10 ** Math.floor(Math.log10(raw));
  return [1, 2, 5, 10].map((m) => m * p).find((w) => w >= raw * (1 - EDGE_EPS))!;
}

/**
 * Bin width: a whole fraction of the tolerance when both limits are set, so both fall on edges;
 * otherwise a round width. `target` bins would cover the data and the limits together.
 */
function binWidth(span: number, spec: SpecLimits, target: number, maxBins: number): number {
  if (spec.lower !== null && spec.upper !== null) {
    const tol = spec.upper - spec.lower;
    return tol / Math.min(maxBins - 2, Math.max(1, Math.round((tol * target) / span)));
  }
  if (span === 0) return 1;
  return niceWidth(Math.max(span / target, span / (maxBins - 1)));
}

/** Position of x in bin widths from the anchor, snapped to a whole number when on an edge. */
function position(x: number, anchor: number, width: number): number {
  const t = (x - anchor) / width;
  const r = Math.round(t);
  return Math.abs(t - r) < EDGE_EPS ? r : t;
}

/**
 * The run of bins drawn. Readings far outside the tolerance would need more than maxBins bins of
 * the tolerance's width; then the first and last bins are widened to reach them (their edges say
 * so), keeping the bins at and between the limits as they are.
 */
function binWindow(
  first: number,
  last: number,
  edges: { lower: number | null; upper: number | null },
  maxBins: number,
) {
  if (last - first <= maxBins || edges.lower === null || edges.upper === null) return { from: first, to: last };
  const side = Math.floor((maxBins - (edges.upper - edges.lower)) / 2);
  return { from: Math.max(first, edges.lower - side), to: Math.min(last, edges.upper + side) };
}

export function histogram(values: readonly number[], spec: SpecLimits, opts: HistogramOptions = {}): Histogram {
  requireFinite(values);
  if (values.length === 0) throw new RangeError('a histogram needs at least one reading');
  if (spec.lower !== null && spec.upper !== null && !(spec.lower < spec.upper)) {
    throw new RangeError('the lower specification limit must lie below the upper one');
  }
  const maxBins = opts.maxBins ?? 60;
  const target = Math.min(maxBins, opts.bins ?? Math.ceil(Math.log2(values.length)) + 1);
  if (!Number.isInteger(maxBins) || maxBins < 3 || !Number.isInteger(target) || target < 1) {
    throw new RangeError('bins must be a positive whole number, and maxBins at least 3');
  }
  const lo = Math.min(...values, spec.lower ?? Infinity, spec.upper ?? Infinity);
  const hi = Math.max(...values, spec.lower ?? -Infinity, spec.upper ?? -Infinity);
  const width = binWidth(hi - lo, spec, target, maxBins);
  const anchor = spec.lower ?? spec.upper ?? Math.floor(lo / width) * width;
  const edges = {
    lower: spec.lower === null ? null : 0,
    upper: spec.upper === null ? null : Math.round(position(spec.upper, anchor, width)),
  };
  const first = Math.floor(position(lo, anchor, width));
  const last = Math.max(first + 1, Math.ceil(position(hi, anchor, width)));
  const { from, to } = binWindow(first, last, edges, maxBins);

  const counts = new Array<number>(to - from).fill(0);
  for (const v of values) {
    const t = position(v, anchor, width);
    let j = Math.floor(t);
    // on an edge a reading belongs to the bin above it, except on the upper limit and the last edge
    if (Number.isInteger(t) && (t === edges.upper || t === last)) j -= 1;
    counts[Math.min(to - 1, Math.max(from, j)) - from]! += 1;
  }
  const zone = (j: number): BinZone =>
    edges.lower !== null && j < edges.lower ? 'below' : edges.upper !== null && j >= edges.upper ? 'above' : 'within';
  const bins = counts.map((count, i) => {
    const j = from + i;
    return {
      lower: j === from && from > first ? lo : anchor + j * width,
      upper: j === to - 1 && to < last ? hi : anchor + (j + 1) * width,
      count,
      zone: zone(j),
    };
  });
  return { n: values.length, width, spec, bins };
}
