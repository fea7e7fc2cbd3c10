import { describe, expect, it } from 'vitest';
import {
  camTiming,
  compressionRatio,
  compressionSpread,
  flatness,
  horsepower,
  oilClearance,
  outOfRound,
  pistonToWall,
  taper,
} from '../../shared/domain/engine-math.js';
import { hpToW } from '../../shared/domain/units.js';

describe('power from torque', () => {
  it('5252 = 33 000 / 2π (derivation from 1 hp = 550 ft·lbf/s)', () => {
    expect(33_000 / (2 * Math.PI)).toBeCloseTo(5252.11, 2);
  });
  it('300 lbf·ft at 4000 rpm → 228.5 hp (derivation: hp = lbf·ft × rpm / 5252.11); ≈ 170.4 kW by NIST SP 811', () => {
    expect(horsepower(300, 4000)).toBeCloseTo(228.5, 1);
    expect(hpToW(horsepower(300, 4000)) / 1000).toBeCloseTo(170.4, 1);
  });
});

describe('static compression ratio (Heywood definition)', () => {
  it('4.25 × 4.00 in, 0.051 in gasket at bore, 0.005 in deck, 64 cm³ chamber, 1.22 in³ dish → 10.585:1 (recomputed)', () => {
    const r = compressionRatio({
      boreIn: 4.25,
      strokeIn: 4.0,
      chamberCc: 64,
      gasketThicknessIn: 0.051,
      gasketBoreIn: 4.25,
      deckClearanceIn: 0.005,
      dishIn3: 1.22,
    });
    expect(r.sweptCc).toBeCloseTo(929.9, 1);
    expect(r.clearanceCc).toBeCloseTo(97.0, 1);
    expect(r.ratio).toBeCloseTo(10.585, 3);
  });
});

describe('cam timing from the card (common practice; example recomputed)', () => {
  it('IO 31° BTDC, IC 63° ABDC, EO 77° BBDC, EC 29° ATDC → 274°/286°, ICL 106°, ECL 114°, LSA 110°, 4° advanced, 60° overlap', () => {
    expect(
      camTiming({ intakeOpensBtdc: 31, intakeClosesAbdc: 63, exhaustOpensBbdc: 77, exhaustClosesAtdc: 29 }),
    ).toEqual({
      intakeDuration: 274,
      exhaustDuration: 286,
      intakeCentreline: 106,
      exhaustCentreline: 114,
      lobeSeparation: 110,
      advance: 4,
      overlap: 60,
    });
  });
});

describe('derived readings (common shop practice)', () => {
  it('out-of-round and taper of a bore', () => {
    expect(outOfRound([4.0302, 4.0298])).toBeCloseTo(0.0004, 10);
    expect(taper(4.0305, 4.0299)).toBeCloseTo(0.0006, 10);
    expect(() => outOfRound([4.03])).toThrow();
  });
  it('clearances', () => {
    expect(pistonToWall(4.0305, 4.0285)).toBeCloseTo(0.002, 10);
    // rule of thumb ≈ 0.001 in per inch of journal (common practice): a 2.5 in journal ≈ 0.0025 in
    expect(oilClearance(2.5025, 2.5)).toBeCloseTo(0.0025, 10);
  });
  it('compression spread: 150 and 135 psi → 10 % (the common shop limit)', () => {
    expect(compressionSpread([150, 148, 135, 145])).toBeCloseTo(0.1, 10);
    expect(() => compressionSpread([])).toThrow();
  });
  it('flatness is the spread of point readings', () => {
    expect(flatness([0.0, 0.0012, -0.0008, 0.0004])).toBeCloseTo(0.002, 10);
  });
});
