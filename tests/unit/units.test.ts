import { unit } from 'mathjs';
import { describe, expect, it } from 'vitest';
import {
  hpToW,
  in3ToCm3,
  inHgToKPa,
  inToMm,
  lbfFtToNm,
  microinToMicrom,
  mmToIn,
  nmToLbfFt,
  psiToKPa,
} from '../../shared/domain/units.js';
import { displacement, displacementLitres } from '../../shared/domain/geometry.js';

// NIST Special Publication 811 (2008), Appendix B.8, and mathjs' own unit tables as a cross-check.
describe('unit conversion (NIST SP 811, Appendix B.8)', () => {
  it('in → mm is exactly 25.4', () => {
    expect(inToMm(1)).toBe(25.4);
    expect(mmToIn(101.6)).toBeCloseTo(4, 12);
    expect(unit(1, 'inch').toNumber('mm')).toBeCloseTo(inToMm(1), 12);
  });
  it('µin → µm is exactly 0.0254', () => {
    expect(microinToMicrom(1)).toBeCloseTo(0.0254, 15);
    expect(microinToMicrom(50)).toBeCloseTo(1.27, 12);
  });
  it('lbf·ft → N·m is 1.355 818', () => {
    expect(lbfFtToNm(1)).toBeCloseTo(1.355818, 6);
    expect(nmToLbfFt(lbfFtToNm(85))).toBeCloseTo(85, 10);
    expect(unit(1, 'lbf').multiply(unit(1, 'ft')).toNumber('N m')).toBeCloseTo(lbfFtToNm(1), 9);
  });
  it('psi → kPa is 6.894 757', () => {
    expect(psiToKPa(1)).toBeCloseTo(6.894757, 6);
    expect(unit(1, 'psi').toNumber('kPa')).toBeCloseTo(psiToKPa(1), 5);
  });
  it('inHg (conventional) → kPa is 3.386 389', () => {
    expect(inHgToKPa(1)).toBeCloseTo(3.386389, 6);
    // mathjs has no inHg; 1 inHg (conventional) = 25.4 mmHg (NIST SP 811 lists both conventional units)
    expect(unit(25.4, 'mmHg').toNumber('kPa')).toBeCloseTo(inHgToKPa(1), 3);
  });
  it('in³ → cm³ is exactly 16.387 064', () => {
    expect(in3ToCm3(1)).toBeCloseTo(16.387064, 12);
    expect(unit(1, 'in^3').toNumber('cm^3')).toBeCloseTo(in3ToCm3(1), 9);
  });
  it('hp (550 ft·lbf/s) → W is 745.6999', () => {
    expect(hpToW(1)).toBeCloseTo(745.6999, 4);
    expect(unit(1, 'hp').toNumber('W')).toBeCloseTo(hpToW(1), 3);
  });
});

describe('displacement = π/4 × bore² × stroke × cylinders', () => {
  it('4.0 in × 3.5 in × 8 → 351.86 in³ (recomputed)', () => {
    expect(displacement(4, 3.5, 8)).toBeCloseTo(351.86, 2);
  });
  it('4.5 cm × 10 cm × 4 → 636.17 cm³ (recomputed)', () => {
    expect(displacement(4.5, 10, 4)).toBeCloseTo(636.17, 2);
  });
  it('4.000 in × 3.622 in V8 ≈ 364 in³ ≈ 5.97 L (common knowledge)', () => {
    expect(displacement(4, 3.622, 8)).toBeCloseTo(364.1, 1);
    expect(displacementLitres(inToMm(4), inToMm(3.622), 8)).toBeCloseTo(5.97, 2);
  });
});
