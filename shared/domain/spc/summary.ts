/** Plain summaries the charts and indices are built from, with the checks every caller needs. */

export function requireFinite(values: readonly number[], what = 'readings'): void {
  if (values.some((v) => !Number.isFinite(v))) throw new RangeError(`${what} must be finite numbers`);
}

export function mean(values: readonly number[]): number {
  if (values.length === 0) throw new RangeError('a mean needs at least one reading');
  let sum = 0;
  for (const v of values) sum += v;
  return sum / values.length;
}

/** Sample standard deviation (n − 1 in the denominator), two-pass for accuracy on near-equal readings. */
export function sampleSd(values: readonly number[]): number {
  if (values.length < 2) throw new RangeError('a standard deviation needs at least two readings');
  const m = mean(values);
  let ss = 0;
  for (const v of values) ss += (v - m) * (v - m);
  return Math.sqrt(ss / (values.length - 1));
}

export function range(values: readonly number[]): number {
  if (values.length === 0) throw new RangeError('a range needs at least one reading');
  // a loop, not Math.max(...values): spreading a year of readings overflows the call stack
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return hi - lo;
}

/** |x(i) − x(i−1)| for i = 1…n−1 (the moving range of two, e-Handbook §6.3.2.2). */
export function movingRanges(values: readonly number[]): number[] {
  const out: number[] = [];
  for (let i = 1; i < values.length; i++) out.push(Math.abs(values[i]! - values[i - 1]!));
  return out;
}
