import { describe, expect, it } from 'vitest';
import { judgeAttribute, judgeValue, limitsOf, roundToResolution } from '../../shared/domain/tolerance.js';

describe('rounding for conformance (ASTM E29, rounding method)', () => {
  // ASTM E29 §6.4: a 5 followed only by zeros goes to the even digit (from memory, as commonly cited)
  it('rounds half to even', () => {
    expect(roundToResolution(2.25, 0.1)).toBe(2.2);
    expect(roundToResolution(2.35, 0.1)).toBe(2.4);
    expect(roundToResolution(-2.25, 0.1)).toBe(-2.2);
    expect(roundToResolution(4.0005, 0.001)).toBe(4.0);
    expect(roundToResolution(4.0015, 0.001)).toBe(4.002);
  });
  it('rounds anything past the half up and anything short of it down', () => {
    expect(roundToResolution(2.2501, 0.1)).toBe(2.3);
    expect(roundToResolution(2.2499, 0.1)).toBe(2.2);
  });
  it('rounds to a resolution that is not a power of ten', () => {
    expect(roundToResolution(12.3, 0.5)).toBe(12.5);
    expect(roundToResolution(12.25, 0.5)).toBe(12.0); // half to even: 24.5 halves → 24
  });
  it('uses decimal arithmetic, not binary floating point', () => {
    expect(roundToResolution(0.1 + 0.2, 0.1)).toBe(0.3);
    expect(roundToResolution(1.0005, 0.0001)).toBe(1.0005);
  });
});

describe('limits and verdicts', () => {
  const bore = {
    limitType: 'nominal' as const,
    nominal: 4.03,
    minusTol: 0.0005,
    plusTol: 0.0005,
    resolution: 0.0001,
    unit: 'in',
  };

  it('nominal ± tolerance sets the limits (decimal, so 4.0295 and 4.0305 exactly)', () => {
    expect(limitsOf(bore)).toEqual({ lower: 4.0295, upper: 4.0305 });
  });
  it('a reading exactly on a limit conforms', () => {
    expect(judgeValue(4.0305, bore).verdict).toBe('pass');
    expect(judgeValue(4.0295, bore).verdict).toBe('pass');
  });
  it('only the rounded reading is compared: 4.03054 rounds to 4.0305 and passes, 4.03056 fails', () => {
    expect(judgeValue(4.03054, bore)).toMatchObject({ verdict: 'pass', rounded: 4.0305 });
    expect(judgeValue(4.03056, bore)).toMatchObject({
      verdict: 'fail',
      rounded: 4.0306,
      reason: '4.0306 in is above the upper limit 4.0305 in',
    });
    expect(judgeValue(4.02944, bore)).toMatchObject({ verdict: 'fail', rounded: 4.0294 });
  });
  it('one-sided rules: minimum and maximum', () => {
    // common practice: cylinder out-of-round ≤ 0.001 in (service limit 0.002 in)
    const outOfRound = { limitType: 'max' as const, upperLimit: 0.001, resolution: 0.0001, unit: 'in' };
    expect(judgeValue(0.001, outOfRound).verdict).toBe('pass');
    expect(judgeValue(0.0011, outOfRound).verdict).toBe('fail');
    const oilPressure = { limitType: 'min' as const, lowerLimit: 10, resolution: 1, unit: 'psi' };
    expect(judgeValue(9.6, oilPressure)).toMatchObject({ verdict: 'pass', rounded: 10 });
    expect(judgeValue(9.4, oilPressure)).toMatchObject({ verdict: 'fail', rounded: 9 });
  });
  it('min/max range', () => {
    const finish = { limitType: 'range' as const, lowerLimit: 60, upperLimit: 100, resolution: 1, unit: 'µin' };
    expect(judgeValue(59.5, finish)).toMatchObject({ verdict: 'pass', rounded: 60 });
    expect(judgeValue(100.5, finish)).toMatchObject({ verdict: 'pass', rounded: 100 });
    expect(judgeValue(100.51, finish)).toMatchObject({ verdict: 'fail', rounded: 101 });
  });
  it('attributes are pass or fail; values must be finite numbers', () => {
    expect(judgeAttribute(true).verdict).toBe('pass');
    expect(judgeAttribute(false).verdict).toBe('fail');
    expect(() => judgeValue(Number.NaN, bore)).toThrow(/finite/);
    expect(() => judgeValue(1, { limitType: 'attribute' })).toThrow(/attribute/);
  });
});
