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
  alternativesOf,
  conversionFactor,
  convert,
  convertDecimal,
  convertDifference,
  sameQuantity,
  unitInSystem,
  unitOf,
  UNITS,
} from '../../shared/domain/units.js';
import { conversionFactor as gaugeFitFactor } from '../../shared/domain/gauge-fit.js';
import { CHARACTERISTICS } from '../../db/seeders/spec-book.js';
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

// One table of units for every conversion: each pair checked against NIST SP 811 (2008), Appendix B.8
// (B.9 for temperature), and against mathjs where it has the unit.
describe('convert between units of one quantity (NIST SP 811, Appendix B)', () => {
  it('when a length is converted, then in↔mm is 25.4 exactly both ways and µin↔µm 0.0254', () => {
    expect(convert(1, 'in', 'mm')).toBe(25.4); // B.8: inch → meter 2.54 E-02, exact
    expect(convert(101.6, 'mm', 'in')).toBe(4); // B.8 exact factor, so no binary remainder
    expect(convertDecimal('4.0301', 'in', 'mm')!.toString()).toBe('102.36454'); // 4.0301 × 25.4 exactly
    expect(convert(32, 'µin', 'µm')).toBeCloseTo(0.8128, 12); // B.8: microinch → meter 2.54 E-08, exact
    expect(convert(1, 'ft', 'mm')).toBe(304.8); // B.8: foot → meter 3.048 E-01, exact
    expect(convert(0.001, 'in', 'µm')).toBeCloseTo(25.4, 12);
    expect(unit(1, 'inch').toNumber('mm')).toBeCloseTo(convert(1, 'in', 'mm')!, 12);
  });
  it('when a pressure is converted, then psi → kPa is 6.894 757, bar → kPa 100 exactly, inHg → kPa 3.386 389', () => {
    expect(convert(1, 'psi', 'kPa')).toBeCloseTo(6.894757, 6); // B.8: psi → pascal 6.894 757 E+03
    expect(convert(1, 'bar', 'kPa')).toBe(100); // B.8: bar → pascal 1.0 E+05, exact
    expect(convert(1, 'bar', 'psi')).toBeCloseTo(14.503774, 6); // 1.0 E+05 ÷ 6.894 757 293 E+03 (B.8, recomputed)
    expect(convert(1, 'inHg', 'kPa')).toBeCloseTo(3.386389, 6); // B.8: inch of mercury, conventional 3.386 389 E+03
    expect(convert(150, 'psi', 'bar')).toBeCloseTo(10.342136, 6); // 150 × 6.894 757 293 E+03 ÷ 1 E+05 (recomputed)
    expect(unit(1, 'bar').toNumber('psi')).toBeCloseTo(convert(1, 'bar', 'psi')!, 5);
  });
  it('when a torque is converted, then lbf·ft → N·m is 1.355 818 and lbf·in → N·m 0.112 984 8', () => {
    expect(convert(1, 'lbf·ft', 'N·m')).toBeCloseTo(1.355818, 6); // B.8: pound-force foot → N·m 1.355 818 E+00
    expect(convert(1, 'lbf·in', 'N·m')).toBeCloseTo(0.1129848, 7); // B.8: pound-force inch → N·m 1.129 848 E-01
    expect(convert(12, 'lbf·in', 'lbf·ft')).toBeCloseTo(1, 12); // 12 in to the foot
    expect(convert(100, 'N·m', 'lbf·ft')).toBeCloseTo(73.756215, 6); // 100 ÷ 1.355 817 948 3 (B.8, recomputed)
    expect(unit(1, 'lbf').multiply(unit(1, 'in')).toNumber('N m')).toBeCloseTo(convert(1, 'lbf·in', 'N·m')!, 9);
  });
  it('when a temperature is converted, then °F and °C follow B.9 (t/°C = (t/°F − 32)/1.8)', () => {
    expect(convert(212, '°F', '°C')).toBeCloseTo(100, 10); // B.9 formula; water boils at 100 °C (common knowledge)
    expect(convert(32, '°F', '°C')).toBeCloseTo(0, 10); // B.9
    expect(convert(-40, '°C', '°F')).toBeCloseTo(-40, 10); // B.9: the scales cross at −40
    expect(convert(90, '°C', '°F')).toBeCloseTo(194, 10); // B.9: 90 × 1.8 + 32
    expect(convert(0, '°C', 'K')).toBeCloseTo(273.15, 10); // B.9: T/K = t/°C + 273.15
    expect(unit(194, 'degF').toNumber('degC')).toBeCloseTo(convert(194, '°F', '°C')!, 9);
  });
  it('when power, volume, angle or imbalance is converted, then the B.8 factors hold', () => {
    expect(convert(1, 'hp', 'W')).toBeCloseTo(745.6999, 4); // B.8: horsepower (550 ft·lbf/s) 7.456 999 E+02
    expect(convert(1, 'in³', 'cm³')).toBeCloseTo(16.387064, 9); // B.8: cubic inch 1.638 706 4 E-05 m³, exact
    expect(convert(1, 'L', 'in³')).toBeCloseTo(61.023744, 6); // B.8: 1.0 E-03 ÷ 1.638 706 4 E-05 (recomputed)
    expect(convert(1, 'deg', 'deg')).toBe(1);
    expect(convert(1, 'oz·in', 'g·mm')).toBeCloseTo(720.077887375, 9); // B.8: ounce 2.834 952 E-02 kg (exact 28.349 523 125 g) × 25.4 mm, recomputed
    expect(convert(0.1, 'g·in', 'g·mm')).toBeCloseTo(2.54, 12);
  });
  it('when the units measure different quantities or are unknown, then nothing converts', () => {
    expect(convert(1, 'in', 'psi')).toBeNull();
    expect(convert(1, 'in', 'furlong')).toBeNull();
    expect(convert(1, null, 'in')).toBeNull();
    expect(convert(3, null, null)).toBe(3);
    expect(conversionFactor('°F', '°C')).toBeNull(); // an offset: no factor alone
    expect(convertDifference(1, '°C', '°F')).toBeCloseTo(1.8, 12); // a band scales without the offset (B.9)
  });
  it('when a unit is typed the way people type it, then it reads as the symbol (um, Nm, degF)', () => {
    expect(unitOf('um')?.symbol).toBe('µm');
    expect(unitOf('μm')?.symbol).toBe('µm'); // Greek mu
    expect(unitOf('Nm')?.symbol).toBe('N·m');
    expect(unitOf('degF')?.symbol).toBe('°F');
    expect(alternativesOf('in').map((u) => u.symbol)).toEqual(['m', 'cm', 'mm', 'µm', 'ft', 'µin']);
    expect(alternativesOf('rpm')).toEqual([]);
  });
  it('when the gauge suitability check scales a range, then it uses the same factors (one module)', () => {
    expect(gaugeFitFactor('in', 'mm')).toBe(conversionFactor('in', 'mm'));
    expect(gaugeFitFactor('psi', 'inHg')).toBeCloseTo(2.036021, 6); // 6 894.757 293 ÷ 3 386.388 640 (B.8, recomputed)
  });
});

describe('every characteristic has a unit', () => {
  it('when the demo spec book is read, then each measured or derived characteristic names a unit Coretrail converts', () => {
    const measured = CHARACTERISTICS.filter((c) => c.kind !== 'attribute');
    expect(measured.length).toBeGreaterThan(30);
    const unknown = measured.filter((c) => !unitOf(c.unit)).map((c) => `${c.stage}/${c.code}: ${c.unit ?? 'none'}`);
    expect(unknown).toEqual([]);
  });
});

describe('the unit a reading starts in, from the person’s unit system', () => {
  it('when someone works in metric, then an inch characteristic starts in millimetres, a psi one in kPa, and a minute stays a minute', () => {
    // counterparts in a machine shop: common practice
    expect(unitInSystem('in', 'metric')).toBe('mm');
    expect(unitInSystem('µin', 'metric')).toBe('µm');
    expect(unitInSystem('psi', 'metric')).toBe('kPa');
    expect(unitInSystem('lbf·ft', 'metric')).toBe('N·m');
    expect(unitInSystem('°F', 'metric')).toBe('°C');
    expect(unitInSystem('min', 'metric')).toBe('min');
    expect(unitInSystem('mm', 'metric')).toBe('mm');
  });
  it('when someone works in inch, then a millimetre characteristic starts in inches and every counterpart converts', () => {
    expect(unitInSystem('mm', 'inch')).toBe('in');
    expect(unitInSystem('N·m', 'inch')).toBe('lbf·ft');
    expect(unitInSystem('in', 'inch')).toBe('in');
    for (const u of UNITS) {
      for (const system of ['inch', 'metric'] as const) {
        const to = unitInSystem(u.symbol, system);
        // the counterpart always measures the same quantity, so a typed value converts
        expect(sameQuantity(u.symbol, to), `${u.symbol} → ${to}`).toBe(true);
      }
    }
  });
});
