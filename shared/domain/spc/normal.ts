/**
 * The standard normal distribution and the log-gamma function, in doubles.
 *
 * Written here rather than imported so that shared/ stays free of runtime dependencies; the unit
 * tests hold each function against jstat from the npm registry. The tail matters: expected parts
 * per million outside a tolerance at Cpk 2 is a few parts per billion, so Φ must keep its relative
 * precision far out, which a 1 − Φ(z) written naively does not.
 */

const SQRT_2PI = Math.sqrt(2 * Math.PI);

/** Density of the standard normal distribution. */
export function normalPdf(z: number): number {
  return Math.exp(-0.5 * z * z) / SQRT_2PI;
}

/**
 * Φ(z), the standard normal cumulative distribution. Hart's double-precision algorithm (1968,
 * algorithm 5666) as set out by West, "Better approximations to cumulative normal functions"
 * (Wilmott, 2005): a rational function near the centre and a continued fraction in the tails,
 * each computed for the lower tail of |z| so that small probabilities keep their digits.
 */
export function normalCdf(z: number): number {
  if (Number.isNaN(z)) return Number.NaN;
  const x = Math.abs(z);
  let tail: number;
  if (x > 37) {
    tail = 0;
  } else if (x < 7.07106781186547) {
    const e = Math.exp(-0.5 * x * x);
    let num = 3.52624965998911e-2 * x + 0.700383064443688;
    num = num * x + 6.37396220353165;
    num = num * x + 33.912866078383;
    num = num * x + 112.079291497871;
    num = num * x + 221.213596169931;
    num = num * x + 220.206867912376;
    let den = 8.83883476483184e-2 * x + 1.75566716318264;
    den = den * x + 16.064177579207;
    den = den * x + 86.7807322029461;
    den = den * x + 296.564248779674;
    den = den * x + 637.333633378831;
    den = den * x + 793.826512519948;
    den = den * x + 440.413735824752;
    tail = (e * num) / den;
  } else {
    const e = Math.exp(-0.5 * x * x);
    let cf = x + 0.65;
    cf = x + 4 / cf;
    cf = x + 3 / cf;
    cf = x + 2 / cf;
    cf = x + 1 / cf;
    tail = e / cf / SQRT_2PI;
  }
  return z > 0 ? 1 - tail : tail;
}

/** Φ(−z) = 1 − Φ(z), the upper tail, without losing digits to the subtraction. */
export function normalUpperTail(z: number): number {
  return normalCdf(-z);
}

// Acklam's rational approximation to Φ⁻¹ (relative error below 1.2e-9), refined below.
const A = [
  -39.69683028665376, 220.9460984245205, -275.9285104469687, 138.357751867269, -30.66479806614716, 2.506628277459239,
];
const B = [-54.47609879822406, 161.5858368580409, -155.6989798598866, 66.80131188771972, -13.28068155288572];
const C = [
  -0.007784894002430293, -0.3223964580411365, -2.400758277161838, -2.549732539343734, 4.374664141464968,
  2.938163982698783,
];
const D = [0.007784695709041462, 0.3224671290700398, 2.445134137142996, 3.754408661907416];
const P_LOW = 0.02425;

const poly = (cs: number[], x: number) => cs.reduce((acc, c) => acc * x + c, 0);

function acklam(p: number): number {
  if (p < P_LOW) {
    const q = Math.sqrt(-2 * Math.log(p));
    return poly(C, q) / (poly(D, q) * q + 1);
  }
  if (p > 1 - P_LOW) {
    const q = Math.sqrt(-2 * Math.log(1 - p));
    return -poly(C, q) / (poly(D, q) * q + 1);
  }
  const q = p - 0.5;
  const r = q * q;
  return (poly(A, r) * q) / (poly(B, r) * r + 1);
}

/**
 * Φ⁻¹(p), the standard normal quantile: Acklam's approximation and one Halley step against
 * normalCdf, which brings it to nearly full double precision (Acklam's own recommendation).
 */
export function normalQuantile(p: number): number {
  if (!(p >= 0 && p <= 1)) throw new RangeError('a probability must lie between 0 and 1');
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  const x = acklam(p);
  const e = normalCdf(x) - p;
  const u = e * SQRT_2PI * Math.exp(0.5 * x * x);
  return x - u / (1 + (x * u) / 2);
}

// Lanczos approximation, g = 7, nine coefficients (about 15 significant digits for x > 0).
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
  12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
];

/** ln Γ(x) for x > 0 (c4 needs Γ at half-integers for any subgroup size). */
export function lnGamma(x: number): number {
  if (!(x > 0)) throw new RangeError('lnGamma is defined here for positive numbers only');
  if (x < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * x)) - lnGamma(1 - x);
  const y = x - 1;
  let sum = LANCZOS[0]!;
  for (let i = 1; i < LANCZOS.length; i++) sum += LANCZOS[i]! / (y + i);
  const t = y + 7.5;
  return 0.5 * Math.log(2 * Math.PI) + (y + 0.5) * Math.log(t) - t + Math.log(sum);
}
