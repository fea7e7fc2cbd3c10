import { in3ToCm3 } from './units.js';

/**
 * The trade's arithmetic on readings. Each function names where its formula comes from; the
 * tests hold them to published or recomputed figures.
 */

/** Out-of-round at one depth: largest minus smallest diameter measured there (common shop practice). */
export function outOfRound(diameters: number[]): number {
  if (diameters.length < 2) throw new RangeError('out-of-round needs at least two diameters');
  return Math.max(...diameters) - Math.min(...diameters);
}

/** Taper: the difference between diameters at the top and bottom of ring travel (common shop practice). */
export const taper = (top: number, bottom: number) => Math.abs(top - bottom);

/** Piston-to-wall clearance = finished bore − piston skirt diameter (common shop practice). */
export const pistonToWall = (bore: number, skirt: number) => bore - skirt;

/** Oil clearance = bearing inside diameter − journal diameter (common shop practice). */
export const oilClearance = (bearingId: number, journalOd: number) => bearingId - journalOd;

/** Compression spread = (highest − lowest) / highest, across cylinders (common practice: ≤ 10 %). */
export function compressionSpread(pressures: number[]): number {
  if (!pressures.length) throw new RangeError('no cylinders');
  const hi = Math.max(...pressures);
  const lo = Math.min(...pressures);
  if (hi <= 0) throw new RangeError('pressures must be positive');
  return (hi - lo) / hi;
}

/** Deck flatness from point readings against a reference plane: the spread of the points. */
export function flatness(points: number[]): number {
  if (points.length < 3) throw new RangeError('flatness needs at least three points');
  return Math.max(...points) - Math.min(...points);
}

/** Power from torque: hp = lbf·ft × rpm / 5252.11, from 1 hp = 33 000 ft·lbf/min and P = 2π·T·n. */
export const HP_CONSTANT = 33_000 / (2 * Math.PI);
export const horsepower = (torqueLbfFt: number, rpm: number) => (torqueLbfFt * rpm) / HP_CONSTANT;

/**
 * Static compression ratio = (swept + clearance) / clearance, where clearance = chamber + gasket +
 * deck clearance + dish − dome (definition as in Heywood, Internal Combustion Engine Fundamentals).
 * Inches for lengths, cm³ for the chamber, in³ for dish (positive) or dome (negative).
 */
export function compressionRatio(p: {
  boreIn: number;
  strokeIn: number;
  chamberCc: number;
  gasketThicknessIn: number;
  gasketBoreIn: number;
  deckClearanceIn: number;
  dishIn3: number;
}): { sweptCc: number; clearanceCc: number; ratio: number } {
  const cyl = (d: number, h: number) => (Math.PI / 4) * d * d * h;
  const sweptCc = in3ToCm3(cyl(p.boreIn, p.strokeIn));
  const gasketCc = in3ToCm3(cyl(p.gasketBoreIn, p.gasketThicknessIn));
  const deckCc = in3ToCm3(cyl(p.boreIn, p.deckClearanceIn));
  const clearanceCc = p.chamberCc + gasketCc + deckCc + in3ToCm3(p.dishIn3);
  return { sweptCc, clearanceCc, ratio: (sweptCc + clearanceCc) / clearanceCc };
}

/** Cam timing from the card: durations, centrelines, lobe separation and advance (common practice). */
export function camTiming(t: {
  intakeOpensBtdc: number;
  intakeClosesAbdc: number;
  exhaustOpensBbdc: number;
  exhaustClosesAtdc: number;
}) {
  const intakeDuration = t.intakeOpensBtdc + 180 + t.intakeClosesAbdc;
  const exhaustDuration = t.exhaustOpensBbdc + 180 + t.exhaustClosesAtdc;
  const intakeCentreline = intakeDuration / 2 - t.intakeOpensBtdc;
  const exhaustCentreline = exhaustDuration / 2 - t.exhaustClosesAtdc;
  const lobeSeparation = (intakeCentreline + exhaustCentreline) / 2;
  return {
    intakeDuration,
    exhaustDuration,
    intakeCentreline,
    exhaustCentreline,
    lobeSeparation,
    advance: lobeSeparation - intakeCentreline,
    overlap: t.intakeOpensBtdc + t.exhaustClosesAtdc,
  };
}

/** Cam advance from the card: lobe separation − intake centreline; positive is advanced (common practice). */
export const camAdvance = (lobeSeparation: number, intakeCentreline: number) => lobeSeparation - intakeCentreline;

/** Specific output: horsepower per cubic inch of displacement. */
export const hpPerCubicInch = (hp: number, displacementIn3: number) => {
  if (displacementIn3 <= 0) throw new RangeError('displacement must be positive');
  return hp / displacementIn3;
};

/**
 * A fastener specification: a torque, or (torque-to-yield) a seating torque and then an angle.
 * A torque-to-yield bolt is stretched past its yield point and is never reused (common practice).
 */
export type FastenerSpec = { torque: number; angle?: number; torqueTol?: number; angleTol?: number };

export function judgeFastener(
  spec: FastenerSpec,
  applied: { torque: number; angle?: number; reused?: boolean },
): { ok: boolean; reason: string } {
  const tTol = spec.torqueTol ?? 0;
  if (Math.abs(applied.torque - spec.torque) > tTol) {
    return { ok: false, reason: `torque ${applied.torque} lbf·ft, specified ${spec.torque} ± ${tTol}` };
  }
  if (spec.angle !== undefined) {
    if (applied.reused) return { ok: false, reason: 'a torque-to-yield fastener is never reused' };
    const aTol = spec.angleTol ?? 0;
    if (applied.angle === undefined) return { ok: false, reason: `turn a further ${spec.angle}° after the torque` };
    if (Math.abs(applied.angle - spec.angle) > aTol) {
      return { ok: false, reason: `angle ${applied.angle}°, specified ${spec.angle}° ± ${aTol}°` };
    }
  }
  return { ok: true, reason: 'as specified' };
}
