import Decimal from 'decimal.js';
import { conversionFactor } from './units.js';

/**
 * Whether a gauge can measure a characteristic: its unit converts to the characteristic's, the
 * limits lie inside its range, and its resolution is no coarser than a tenth of the tolerance band
 * (the common "ten to one" rule of thumb; a plant may relax the ratio per characteristic with a
 * recorded reason). Pure: the station form, the submission and the tests run the same code.
 */

/** The factor between two units now lives with the units themselves; kept here for older callers. */
export { conversionFactor };

export type FitGauge = {
  code: string;
  unit: string | null;
  resolution: number | null;
  rangeLow: number | null;
  rangeHigh: number | null;
};

export type FitCharacteristic = {
  name: string;
  unit: string | null;
  /** The lower and upper specification limits in force, in the characteristic's unit. */
  lower: number | null;
  upper: number | null;
  /** The physical floor (a flatness or runout cannot be below 0): closes a one-sided band. */
  physicalMin: number | null;
  /** Band ÷ resolution the plant asks for; 10 unless relaxed with a reason. */
  ratio: number;
};

export type FitRefusal = 'unit' | 'range' | 'resolution';

export type Fit = { ok: true } | { ok: false; reason: FitRefusal; message: string };

const fmt = (v: number) => String(Number(v.toPrecision(8)));

/** The tolerance band the resolution is held to: upper − lower, or upper − physical floor for a maximum. */
export function toleranceBand(c: Pick<FitCharacteristic, 'lower' | 'upper' | 'physicalMin'>): number | null {
  if (c.lower !== null && c.upper !== null) return new Decimal(c.upper).minus(c.lower).toNumber();
  if (c.upper !== null && c.physicalMin !== null) return new Decimal(c.upper).minus(c.physicalMin).toNumber();
  return null;
}

export function gaugeFits(g: FitGauge, c: FitCharacteristic): Fit {
  const factor = conversionFactor(g.unit, c.unit);
  if (factor === null) {
    return {
      ok: false,
      reason: 'unit',
      message: `${g.code} reads in ${g.unit ?? 'no unit'}, which cannot be converted to ${c.unit ?? 'no unit'} for ${c.name.toLowerCase()}.`,
    };
  }
  // the gauge's range and resolution in the characteristic's unit
  const low = g.rangeLow === null ? null : g.rangeLow * factor;
  const high = g.rangeHigh === null ? null : g.rangeHigh * factor;
  const limits = [c.lower, c.upper].filter((v): v is number => v !== null);
  const outside = limits.filter((v) => (low !== null && v < low - 1e-9) || (high !== null && v > high + 1e-9));
  if (outside.length) {
    return {
      ok: false,
      reason: 'range',
      message:
        `The limits of ${c.name.toLowerCase()} (${limits.map(fmt).join(' to ')} ${c.unit ?? ''}) fall outside the range of ${g.code} (${low === null ? '…' : fmt(low)}–${high === null ? '…' : fmt(high)} ${c.unit ?? ''}).`.replace(
          /\s+\)/g,
          ')',
        ),
    };
  }
  const band = toleranceBand(c);
  if (band !== null && band > 0 && g.resolution !== null) {
    const resolution = g.resolution * factor;
    if (resolution > band / c.ratio + 1e-12) {
      return {
        ok: false,
        reason: 'resolution',
        message:
          `${g.code} reads to ${fmt(resolution)} ${c.unit ?? ''}, coarser than 1/${c.ratio} of the ${fmt(band)} ${c.unit ?? ''} tolerance band of ${c.name.toLowerCase()}.`.replace(
            /\s+,/g,
            ',',
          ),
      };
    }
  }
  return { ok: true };
}

/**
 * A reading judged again with the gauge's as-found error as a guard band: could its verdict have
 * been the other one? A pass within `error` of a limit might have been outside it, and a fail
 * within `error` of a limit might have been inside.
 */
export function couldChange(
  value: number,
  verdict: 'pass' | 'fail',
  lower: number | null,
  upper: number | null,
  error: number,
): boolean {
  if (!(error > 0)) return false;
  const nearLower = lower !== null && Math.abs(value - lower) <= error;
  const nearUpper = upper !== null && Math.abs(value - upper) <= error;
  if (verdict === 'pass') return nearLower || nearUpper;
  // a fail changes only if moving by the error brings it back inside every limit
  const lo = lower === null || value + error >= lower;
  const hi = upper === null || value - error <= upper;
  return lo && hi;
}

/** The largest as-found error over a calibration's check points, |as found − reference|. */
export function asFoundError(points: { reference: number; asFound: number }[]): number {
  return points.reduce((m, p) => Math.max(m, new Decimal(p.asFound).minus(p.reference).abs().toNumber()), 0);
}
