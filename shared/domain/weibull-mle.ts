import { StudyDataError } from './study-error.js';
import { type LifeRecord, type WeibullParameters, countOf, sortedRecords } from './weibull.js';

/**
 * Maximum-likelihood Weibull fit with right-censored units (suspensions).
 *
 * With r failures among n units, the log-likelihood is
 *   ℓ(β, η) = r ln β − r β ln η + (β − 1) Σ_failures ln t − Σ_all (t/η)^β.
 * Setting ∂ℓ/∂η = 0 gives η in closed form for any β, η^β = Σ_all t^β / r, and what is left is one
 * equation in β (as in Nelson, Applied Life Data Analysis, 1982; from memory):
 *   g(β) = Σ t^β ln t / Σ t^β − 1/β − (1/r) Σ_failures ln t = 0.
 * g rises strictly with β (its slope is a weighted variance of ln t plus 1/β²), so it has at most
 * one root; it is found by Newton's method kept inside a bracket that bisection narrows.
 */

export type MleFit = WeibullParameters & {
  method: 'maximum-likelihood';
  logLikelihood: number;
  failures: number;
  suspensions: number;
  iterations: number;
};

type Weighted = { u: Float64Array; w: Float64Array; failedSumU: number; failures: number; total: number };

function weighted(records: readonly LifeRecord[]): Weighted {
  const sorted = sortedRecords(records);
  const { failures, total } = countOf(sorted);
  if (failures < 1) throw new StudyDataError('maximum likelihood needs at least 1 failure', 'records');
  const u = Float64Array.from(sorted, (r) => Math.log(r.time));
  const w = Float64Array.from(sorted, (r) => r.count);
  const failedSumU = sorted.reduce((s, r, i) => (r.failed ? s + r.count * u[i]! : s), 0);
  return { u, w, failedSumU, failures, total };
}

/**
 * g(β) and g′(β). Powers t^β are taken as exp(β(ln t − ln t_max)) so that a large β or long
 * times cannot overflow; the common factor cancels in every ratio.
 */
function profile(d: Weighted, beta: number) {
  const uMax = d.u[d.u.length - 1]!;
  let a = 0;
  let b = 0;
  let c = 0;
  for (let i = 0; i < d.u.length; i++) {
    const u = d.u[i]!;
    const e = d.w[i]! * Math.exp(beta * (u - uMax));
    a += e;
    b += e * u;
    c += e * u * u;
  }
  const meanU = b / a;
  return {
    g: meanU - 1 / beta - d.failedSumU / d.failures,
    slope: c / a - meanU * meanU + 1 / (beta * beta),
    logA: Math.log(a),
    uMax,
  };
}

function bracket(d: Weighted): [number, number] {
  let lo = 1;
  while (profile(d, lo).g > 0) lo /= 2; // g → −∞ as β → 0, so this ends
  let hi = 1;
  while (profile(d, hi).g < 0) {
    hi *= 2;
    // g(∞) = ln t_max − mean ln t of the failures: not positive when no unit outlasted the failures.
    if (hi > 1e6)
      throw new StudyDataError('every failure is at the longest time, so the data do not give a shape', 'records');
  }
  return [lo, hi];
}

function solveShape(d: Weighted): { beta: number; iterations: number } {
  let [lo, hi] = bracket(d);
  let beta = (lo + hi) / 2;
  for (let i = 1; i <= 200; i++) {
    const { g, slope } = profile(d, beta);
    if (g < 0) lo = beta;
    else hi = beta;
    let next = beta - g / slope;
    if (!(next > lo && next < hi)) next = (lo + hi) / 2; // Newton left the bracket: bisect instead
    if (Math.abs(next - beta) <= 1e-13 * beta || hi - lo <= 1e-13 * beta) return { beta: next, iterations: i };
    beta = next;
  }
  return { beta, iterations: 200 }; // unreachable for a monotone g with a 1e-13 stop; kept finite
}

export function weibullMle(records: readonly LifeRecord[]): MleFit {
  const d = weighted(records);
  if (d.u[0] === d.u[d.u.length - 1]) {
    throw new StudyDataError('every unit has the same time, so the data do not give a shape', 'records');
  }
  const { beta, iterations } = solveShape(d);
  const { logA, uMax } = profile(d, beta);
  // η^β = Σ t^β / r, in logs: ln η = ln t_max + (ln Σ exp(β(ln t − ln t_max)) − ln r)/β.
  const logEta = uMax + (logA - Math.log(d.failures)) / beta;
  // At the optimum Σ (t/η)^β = r, which the last term uses.
  const logLikelihood =
    d.failures * Math.log(beta) - d.failures * beta * logEta + (beta - 1) * d.failedSumU - d.failures;
  return {
    shape: beta,
    scale: Math.exp(logEta),
    method: 'maximum-likelihood',
    logLikelihood,
    failures: d.failures,
    suspensions: d.total - d.failures,
    iterations,
  };
}

/** ℓ(β, η) for any parameters: for checking a fit, or comparing two. */
export function weibullLogLikelihood(records: readonly LifeRecord[], { shape, scale }: WeibullParameters): number {
  const sorted = sortedRecords(records);
  let sum = 0;
  for (const r of sorted) {
    const z = (r.time / scale) ** shape;
    sum += r.count * (r.failed ? Math.log(shape / scale) + (shape - 1) * Math.log(r.time / scale) - z : -z);
  }
  return sum;
}
