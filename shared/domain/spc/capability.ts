import { normalCdf, normalQuantile } from './normal.js';
import { mean, requireFinite, sampleSd } from './summary.js';

/**
 * Process capability (NIST/SEMATECH e-Handbook §6.1.6): how the process spread sits inside the
 * tolerance. Cp and Cpk use the short-term σ a control chart estimates (R̄/d2, s̄/c4, MR̄/d2);
 * Pp and Ppk the overall sample standard deviation of every reading. A one-sided tolerance has no
 * Cp, and its Cpk is the one side's index. Expected parts per million outside assume a normal
 * process, which is why the capability screen shows the normality check beside them.
 */

/** Lower and upper specification limits, as limitsOf() in tolerance.ts returns them. */
export type SpecLimits = { lower: number | null; upper: number | null };

export type Interval = { lower: number; upper: number; confidence: number };

export type Indices = {
  sigma: number;
  /** (USL − LSL) / 6σ; null for a one-sided tolerance. */
  potential: number | null;
  /** (μ − LSL) / 3σ */
  lowerIndex: number | null;
  /** (USL − μ) / 3σ */
  upperIndex: number | null;
  /** min(lowerIndex, upperIndex) */
  index: number;
  /** Bissell (1990) normal approximation on `index`. */
  interval: Interval;
  /** Expected parts per million below LSL, above USL, and in all, from the normal distribution. */
  ppm: { below: number; above: number; total: number };
};

export type Capability = {
  n: number;
  mean: number;
  spec: SpecLimits;
  /** Cp, Cpl, Cpu, Cpk from the short-term σ; null when none was given or it is zero. */
  within: Indices | null;
  /** Pp, Ppl, Ppu, Ppk from the overall σ; null when every reading is the same. */
  overall: Indices | null;
};

function checkSpec(spec: SpecLimits) {
  if (spec.lower === null && spec.upper === null)
    throw new RangeError('capability needs at least one specification limit');
  if (spec.lower !== null && spec.upper !== null && !(spec.lower < spec.upper)) {
    throw new RangeError('the lower specification limit must lie below the upper one');
  }
}

/** z for a two-sided interval of the given confidence, e.g. 1.960 for 95 %. */
function twoSidedZ(confidence: number): number {
  if (!(confidence > 0 && confidence < 1)) throw new RangeError('confidence must lie between 0 and 1');
  return normalQuantile(1 - (1 - confidence) / 2);
}

/**
 * Bissell's approximate interval for Cpk from n readings (e-Handbook §6.1.6):
 * Ĉpk ± z·√(1/(9n) + Ĉpk²/(2(n − 1))).
 */
export function cpkInterval(cpk: number, n: number, confidence = 0.95): Interval {
  if (!Number.isInteger(n) || n < 2) throw new RangeError('an interval on Cpk needs at least two readings');
  const half = twoSidedZ(confidence) * Math.sqrt(1 / (9 * n) + (cpk * cpk) / (2 * (n - 1)));
  return { lower: cpk - half, upper: cpk + half, confidence };
}

/** Expected parts per million outside the limits for a normal process of this mean and σ. */
export function expectedPpm(mu: number, sigma: number, spec: SpecLimits) {
  const below = spec.lower === null ? 0 : normalCdf((spec.lower - mu) / sigma) * 1e6;
  const above = spec.upper === null ? 0 : normalCdf((mu - spec.upper) / sigma) * 1e6;
  return { below, above, total: below + above };
}

/** The indices for a process of mean μ and standard deviation σ, judged on n readings. */
export function capabilityIndices(mu: number, sigma: number, spec: SpecLimits, n: number, confidence = 0.95): Indices {
  checkSpec(spec);
  if (!(sigma > 0) || !Number.isFinite(sigma)) throw new RangeError('σ must be a positive number');
  const lowerIndex = spec.lower === null ? null : (mu - spec.lower) / (3 * sigma);
  const upperIndex = spec.upper === null ? null : (spec.upper - mu) / (3 * sigma);
  const potential = spec.lower !== null && spec.upper !== null ? (spec.upper - spec.lower) / (6 * sigma) : null;
  const index = Math.min(lowerIndex ?? Infinity, upperIndex ?? Infinity);
  return {
    sigma,
    potential,
    lowerIndex,
    upperIndex,
    index,
    interval: cpkInterval(index, n, confidence),
    ppm: expectedPpm(mu, sigma, spec),
  };
}

/**
 * Capability of a set of readings against a tolerance. `sigmaWithin` comes from the control chart
 * of the same readings (its limits' sigmaWithin); without it only Pp and Ppk are given, because a
 * short-term σ cannot be told from a bare list of readings whose order and grouping are unknown.
 */
export function capability(
  values: readonly number[],
  spec: SpecLimits,
  opts: { sigmaWithin?: number | null; confidence?: number } = {},
): Capability {
  checkSpec(spec);
  requireFinite(values);
  if (values.length < 2) throw new RangeError('capability needs at least two readings');
  const n = values.length;
  const mu = mean(values);
  const overallSigma = sampleSd(values);
  const within = opts.sigmaWithin;
  if (within !== undefined && within !== null && !(within >= 0 && Number.isFinite(within))) {
    throw new RangeError('the within σ must be a non-negative number');
  }
  return {
    n,
    mean: mu,
    spec,
    within: within ? capabilityIndices(mu, within, spec, n, opts.confidence) : null,
    overall: overallSigma > 0 ? capabilityIndices(mu, overallSigma, spec, n, opts.confidence) : null,
  };
}
