import { describe, expect, it } from 'vitest';
import { camAdvance, horsepower, hpPerCubicInch, judgeFastener } from '../../shared/domain/engine-math.js';
import { displacement } from '../../shared/domain/geometry.js';
import { FACTORS, in3ToCm3, inToMm, lbfFtToNm } from '../../shared/domain/units.js';

// Facts of the trade used as check values. Each is marked "common practice" (no published source
// named) or names its source; conversions use NIST SP 811 Appendix B.8 factors.

describe('cam advance from lobe separation and intake centreline (common practice)', () => {
  it('113° LSA with a 109° intake centreline is 4° advanced', () => {
    expect(camAdvance(113, 109)).toBe(4);
  });
  it('110° LSA with 106° ICL is 4° advanced; 110/112 is 2° retarded', () => {
    expect(camAdvance(110, 106)).toBe(4);
    expect(camAdvance(110, 112)).toBe(-2);
  });
});

describe('specific output (arithmetic; yardsticks are common practice)', () => {
  it('a 6.0 L engine is ≈ 366 in³ (6000 cm³ ÷ 16.387 064, NIST SP 811)', () => {
    expect(6000 / FACTORS.in3ToCm3).toBeCloseTo(366.14, 2);
  });
  it('≈ 1 hp per in³ is a strong stock figure for it; ≈ 1.22 hp/in³ after a camshaft change', () => {
    const in3 = 6000 / FACTORS.in3ToCm3;
    expect(hpPerCubicInch(366, in3)).toBeCloseTo(1.0, 2);
    expect(hpPerCubicInch(447, in3)).toBeCloseTo(1.22, 2);
    expect(() => hpPerCubicInch(300, 0)).toThrow();
  });
  it('power at the test stand: 300 lbf·ft at 4000 rpm → 228.5 hp (hp = T × rpm / 5252)', () => {
    expect(horsepower(300, 4000)).toBeCloseTo(228.5, 1);
  });
  it('a 4.000 × 3.622 in V8 is ≈ 364 in³ ≈ 5.97 L (common knowledge)', () => {
    const in3 = displacement(4, 3.622, 8);
    expect(in3).toBeCloseTo(364.1, 1);
    expect(in3ToCm3(in3) / 1000).toBeCloseTo(5.97, 2);
  });
});

describe('fasteners (common practice)', () => {
  const tty = { torque: 37, angle: 140, torqueTol: 1, angleTol: 5 };
  it('a torque-to-yield bolt: 37 lbf·ft, then 140°', () => {
    expect(judgeFastener(tty, { torque: 37, angle: 140 }).ok).toBe(true);
    expect(judgeFastener(tty, { torque: 37 })).toEqual({ ok: false, reason: 'turn a further 140° after the torque' });
    expect(judgeFastener(tty, { torque: 37, angle: 120 }).ok).toBe(false);
  });
  it('is never reused', () => {
    expect(judgeFastener(tty, { torque: 37, angle: 140, reused: true })).toEqual({
      ok: false,
      reason: 'a torque-to-yield fastener is never reused',
    });
  });
  it('torque-only fasteners: flywheel bolts at 85 lbf·ft (≈ 115.2 N·m), rocker shaft bolts at 22 lbf·ft (≈ 29.8 N·m)', () => {
    expect(judgeFastener({ torque: 85, torqueTol: 2 }, { torque: 86 }).ok).toBe(true);
    expect(judgeFastener({ torque: 22, torqueTol: 1 }, { torque: 25 }).ok).toBe(false);
    expect(lbfFtToNm(85)).toBeCloseTo(115.24, 2);
    expect(lbfFtToNm(22)).toBeCloseTo(29.83, 2);
  });
});

describe('small gaps in both units (NIST SP 811: 1 in = 25.4 mm exactly)', () => {
  it('a spark plug gap of 0.040 in is 1.016 mm', () => {
    expect(inToMm(0.04)).toBeCloseTo(1.016, 12);
  });
  it('oil-pump drive alignment checked with 0.0015 in shims: 0.0381 mm', () => {
    expect(inToMm(0.0015)).toBeCloseTo(0.0381, 12);
  });
});
