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
  /**
   * The step readings are rounded to. With both limits set, the width is then a whole number of
   * steps as well as a whole fraction of the tolerance, so every bin holds the same number of
   * possible readings (otherwise readings at 0.0001 in binned 0.00007 in wide leave every third bin empty).
   */
  resolution?: number | null;
};

const EDGE_EPS = 1e-9;

/** The smallest of 1, 2, 5 × 10ᵏ at least `raw`: widths a reader can add up in their head. */
function niceWidth(raw: number): number {
  const p = 10 ** Math.floor(Math.log10(raw));
  return [1, 2, 5, 10].map((m) => m * p).find((w) => w >= raw * (1 - EDGE_EPS))!;
}

/**
 * Bin width: a whole fraction of the tolerance when both limits are set, so both fall on edges;
 * otherwise a round width. About `target` bins cover the core (see coreSpan), at most `most`.
 */
function binWidth(span: number, spec: SpecLimits, target: number, most: number, resolution?: number | null): number {
  if (spec.lower !== null && spec.upper !== null) {
    const tol = spec.upper - spec.lower;
    const wanted = Math.min(most, Math.max(1, Math.round((tol * target) / span)));
    const steps = resolution && resolution > 0 ? Math.round(tol / resolution) : 0;
    if (steps > 0 && Math.abs(steps * resolution! - tol) < EDGE_EPS * tol) {
      // the divisor of the tolerance's steps nearest the wanted count, within maxBins
      let best = 1;
      for (let k = 1; k <= Math.min(steps, most); k++) {
        if (steps % k === 0 && Math.abs(k - wanted) <= Math.abs(best - wanted)) best = k;
      }
      // a step count with no divisor near the wanted count (a prime) would give a bin or two
      if (best * 2 >= wanted && best <= wanted * 2) return tol / best;
    }
    return tol / wanted;
  }
  if (span === 0) return 1;
  return niceWidth(Math.max(span / target, span / most));
}

/**
 * The span the bins are sized for: the limits and the readings inside Tukey's far-out fences
 * (quartiles ∓ 3 × IQR, common practice), so one wild reading does not squeeze the rest into a
 * bin or two; readings beyond the fences fall in stretched end bins.
 */
function coreSpan(sorted: Float64Array, spec: SpecLimits): { lo: number; hi: number } {
  const q = (p: number) => sorted[Math.round(p * (sorted.length - 1))]!;
  const iqr = q(0.75) - q(0.25);
  const below = q(0.25) - 3 * iqr;
  const above = q(0.75) + 3 * iqr;
  // sorted, so the readings inside the fences are one run (the quartiles among them): its ends are
  // found from the outside in, past the few far-out readings, instead of filtering a year of them
  let first = 0;
  while (sorted[first]! < below) first++;
  let last = sorted.length - 1;
  while (sorted[last]! > above) last--;
  const lo = sorted[first]!;
  const hi = sorted[last]!;
  return {
    lo: Math.min(lo, spec.lower ?? Infinity, spec.upper ?? Infinity),
    hi: Math.max(hi, spec.lower ?? -Infinity, spec.upper ?? -Infinity),
  };
}

/** Position of x in bin widths from the anchor, snapped to a whole number when on an edge. */
function position(x: number, anchor: number, width: number): number {
  const t = (x - anchor) / width;
  const r = Math.round(t);
  return Math.abs(t - r) < EDGE_EPS ? r : t;
}

/** Edges rounded to 12 significant digits, so 4.029999999999999 shows as the 4.03 it is. */
const tidy = (x: number) => Number(x.toPrecision(12));

export function histogram(values: readonly number[], spec: SpecLimits, opts: HistogramOptions = {}): Histogram {
  requireFinite(values);
  if (values.length === 0) throw new RangeError('a histogram needs at least one reading');
  if (spec.lower !== null && spec.upper !== null && !(spec.lower < spec.upper)) {
    throw new RangeError('the lower specification limit must lie below the upper one');
  }
  const maxBins = opts.maxBins ?? 60;
  const target = Math.min(maxBins, opts.bins ?? Math.ceil(Math.log2(values.length)) + 1);
  if (!Number.isInteger(maxBins) || maxBins < 4 || !Number.isInteger(target) || target < 1) {
    throw new RangeError('bins must be a positive whole number, and maxBins at least 4');
  }
  // a typed array sorts numerically without a comparator, several times faster on a year of readings
  const sorted = Float64Array.from(values).sort();
  const core = coreSpan(sorted, spec);
  // room for the anchor's rounding and a stretched bin at each end
  const width = binWidth(core.hi - core.lo, spec, target, maxBins - 3, opts.resolution);
  const anchor = spec.lower ?? spec.upper ?? Math.floor(core.lo / width) * width;
  const pos = (x: number) => position(x, anchor, width);
  const upperEdge = spec.upper === null ? null : Math.round(pos(spec.upper));
  const lowerEdge = spec.lower === null ? null : 0;

  const lo = Math.min(sorted[0]!, core.lo);
  const hi = Math.max(sorted.at(-1)!, core.hi);
  const first = Math.floor(pos(lo));
  const last = Math.max(first + 1, Math.ceil(pos(hi)));
  const wide = last - first > maxBins;
  // beyond the core, one stretched bin each side; it stays wholly outside the tolerance
  const from = wide ? Math.max(first, Math.floor(pos(core.lo)) - 1) : first;
  const to = wide ? Math.min(last, Math.max(from + 1, Math.ceil(pos(core.hi))) + 1) : last;

  const counts = new Array<number>(to - from).fill(0);
  // in sorted order, so a run of equal readings (they come in resolution steps) is placed once
  let prev = Number.NaN;
  let bin = 0;
  for (const v of sorted) {
    if (v !== prev) {
      prev = v;
      const t = pos(v);
      let j = Math.floor(t);
      // on an edge a reading belongs to the bin above it, except on the upper limit and the last edge
      if (Number.isInteger(t) && (t === upperEdge || t === last)) j -= 1;
      bin = Math.min(to - 1, Math.max(from, j)) - from;
    }
    counts[bin]! += 1;
  }
  const zone = (j: number): BinZone =>
    lowerEdge !== null && j < lowerEdge ? 'below' : upperEdge !== null && j >= upperEdge ? 'above' : 'within';
  const bins = counts.map((count, i) => {
    const j = from + i;
    return {
      lower: j === from && from > first ? lo : tidy(anchor + j * width),
      upper: j === to - 1 && to < last ? hi : tidy(anchor + (j + 1) * width),
      count,
      zone: zone(j),
    };
  });
  return { n: values.length, width: tidy(width), spec, bins };
}
