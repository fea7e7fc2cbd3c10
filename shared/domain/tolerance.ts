import Decimal from 'decimal.js';

/**
 * Judging one reading against one tolerance rule.
 *
 * The reading is first rounded to the rule's resolution by the rounding method of ASTM E29
 * ("rounding method" for conformance: a 5 followed only by zeros rounds to the even digit), and
 * only the rounded value is compared with the limits. Limits are inclusive: a reading exactly on a
 * limit conforms. Decimal arithmetic throughout, so 0.1 + 0.2 is 0.3 here.
 */
export type LimitType = 'nominal' | 'range' | 'min' | 'max' | 'attribute';

export type ToleranceRule = {
  limitType: LimitType;
  nominal?: number | null;
  minusTol?: number | null;
  plusTol?: number | null;
  lowerLimit?: number | null;
  upperLimit?: number | null;
  resolution?: number | null;
  unit?: string | null;
};

export type Verdict = 'pass' | 'fail';

export type Judgement =
  | { verdict: Verdict; rounded: number; lower: number | null; upper: number | null; reason: string }
  | { verdict: Verdict; rounded: null; lower: null; upper: null; reason: string };

/** ASTM E29 rounding of `value` to a multiple of `resolution` (half to even). */
export function roundToResolution(value: number | string, resolution: number | string): number {
  const step = new Decimal(resolution);
  if (step.lte(0)) throw new RangeError('resolution must be positive');
  return new Decimal(value).toNearest(step, Decimal.ROUND_HALF_EVEN).toNumber();
}

/** The lower and upper specification limits a rule sets (null where it sets none). */
export function limitsOf(rule: ToleranceRule): { lower: number | null; upper: number | null } {
  const d = (v: number | null | undefined) => (v === null || v === undefined ? null : new Decimal(v));
  switch (rule.limitType) {
    case 'nominal': {
      const n = d(rule.nominal);
      if (!n) throw new RangeError('a nominal rule needs its nominal');
      const minus = d(rule.minusTol) ?? new Decimal(0);
      const plus = d(rule.plusTol) ?? new Decimal(0);
      return { lower: n.minus(minus).toNumber(), upper: n.plus(plus).toNumber() };
    }
    case 'range':
      return { lower: d(rule.lowerLimit)?.toNumber() ?? null, upper: d(rule.upperLimit)?.toNumber() ?? null };
    case 'min':
      return { lower: d(rule.lowerLimit)?.toNumber() ?? null, upper: null };
    case 'max':
      return { lower: null, upper: d(rule.upperLimit)?.toNumber() ?? null };
    case 'attribute':
      return { lower: null, upper: null };
  }
}

/** A measured value against a variable rule. */
export function judgeValue(value: number, rule: ToleranceRule): Judgement {
  if (rule.limitType === 'attribute') throw new RangeError('an attribute rule judges pass/fail results, not values');
  if (!Number.isFinite(value)) throw new RangeError('a reading must be a finite number');
  const rounded = rule.resolution ? roundToResolution(value, rule.resolution) : value;
  const { lower, upper } = limitsOf(rule);
  const r = new Decimal(rounded);
  const unit = rule.unit ? ` ${rule.unit}` : '';
  if (lower !== null && r.lt(lower)) {
    return {
      verdict: 'fail',
      rounded,
      lower,
      upper,
      reason: `${rounded}${unit} is below the lower limit ${lower}${unit}`,
    };
  }
  if (upper !== null && r.gt(upper)) {
    return {
      verdict: 'fail',
      rounded,
      lower,
      upper,
      reason: `${rounded}${unit} is above the upper limit ${upper}${unit}`,
    };
  }
  return { verdict: 'pass', rounded, lower, upper, reason: 'within limits' };
}

/** A pass/fail check (crack test, leak, visual) against an attribute rule. */
export function judgeAttribute(passed: boolean): Judgement {
  return passed
    ? { verdict: 'pass', rounded: null, lower: null, upper: null, reason: 'passed' }
    : { verdict: 'fail', rounded: null, lower: null, upper: null, reason: 'failed' };
}
