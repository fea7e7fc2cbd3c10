import Decimal from 'decimal.js';
import { roundToResolution } from '../domain/tolerance.js';

/**
 * How a printed document writes readings and limits: every number to the places of the rule's
 * resolution (a value rounded as it was judged, ASTM E29), limits with the signs a drawing uses
 * (≤ ≥ ± and the minus sign U+2212), so a column of figures reads the same way down a page.
 */
export type RuleShape = {
  limitType: 'nominal' | 'range' | 'min' | 'max' | 'attribute';
  nominal: number | null;
  minusTol: number | null;
  plusTol: number | null;
  lowerLimit: number | null;
  upperLimit: number | null;
  resolution: number | null;
};

const MINUS = '\u2212';

/** Decimal places a resolution asks for: 0.0001 → 4, 0.5 → 1, 5 → 0. */
export function placesOf(resolution: number | null | undefined): number | null {
  if (resolution === null || resolution === undefined || !(resolution > 0)) return null;
  return Math.max(0, new Decimal(resolution).decimalPlaces());
}

/** A number with a true minus sign, to a fixed number of places when one is known. */
export function fixed(value: number, places: number | null): string {
  const text = places === null ? new Decimal(value).toString() : new Decimal(value).toFixed(places);
  return text.startsWith('-') ? `${MINUS}${text.slice(1)}` : text;
}

/** A reading as it was judged: rounded to the rule's resolution, written to its places. */
export function readingText(value: number, resolution: number | null): string {
  if (resolution === null || !(resolution > 0)) return fixed(value, null);
  return fixed(roundToResolution(value, resolution), placesOf(resolution));
}

/** The limits a rule sets, in a drawing's notation, without the unit. */
export function limitsText(rule: RuleShape | null, lower: number | null, upper: number | null): string {
  const places = placesOf(rule?.resolution);
  const f = (v: number) => fixed(v, places);
  if (rule?.limitType === 'attribute' || (!rule && lower === null && upper === null)) return 'pass / fail';
  if (rule?.limitType === 'nominal' && rule.nominal !== null) {
    const minus = rule.minusTol ?? 0;
    const plus = rule.plusTol ?? 0;
    if (minus === plus) return `${f(rule.nominal)} ± ${f(plus)}`;
    return `${f(rule.nominal)} +${f(plus)} / ${MINUS}${f(minus)}`;
  }
  if (lower !== null && upper !== null) return `${f(lower)} – ${f(upper)}`;
  if (lower !== null) return `≥ ${f(lower)}`;
  if (upper !== null) return `≤ ${f(upper)}`;
  return 'as recorded';
}
