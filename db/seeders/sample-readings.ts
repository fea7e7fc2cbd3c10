import { limitsOf } from '../../shared/domain/tolerance.js';
import type { ReadingInput, StationFormJson } from '../../shared/schemas/results.js';

/**
 * Readings for a station form that pass every rule in force: the middle of each range, a margin
 * above a minimum, half of a maximum. Used to walk demo and test parts along their routes; a
 * function `vary` may change any value (to make one fail, or to scatter them).
 */
export function passingReadings(
  form: Pick<StationFormJson, 'characteristics'>,
  vary: (characteristic: string, position: string, value: number) => number = (_c, _p, v) => v,
): ReadingInput[] {
  const out: ReadingInput[] = [];
  for (const c of form.characteristics) {
    // optional characteristics (torque on a stand without a dynamometer) are left out
    if (c.kind === 'derived' || c.optional) continue;
    for (const p of c.positions) {
      if (c.kind === 'attribute') {
        out.push({ characteristic: c.code, position: p.code, passed: true });
        continue;
      }
      const { lower, upper } = c.rule ? limitsOf(c.rule) : { lower: null, upper: null };
      const step = c.rule?.resolution ?? c.resolution ?? 1;
      let v: number;
      if (lower !== null && upper !== null) v = (lower + upper) / 2;
      else if (lower !== null) v = lower + Math.max(step * 10, Math.abs(lower) * 0.2);
      else if (upper !== null) v = upper / 2;
      else v = 0;
      const rounded = Math.round(v / step) * step;
      out.push({
        characteristic: c.code,
        position: p.code,
        value: Number(vary(c.code, p.code, Number(rounded.toFixed(6))).toFixed(6)),
        unit: c.unit ?? undefined,
      });
    }
  }
  return out;
}

/**
 * The size class a part is finished to, per characteristic with classes: the one whose limits hold
 * the rule's own nominal (the size `passingReadings` takes its values around).
 */
export function nominalSizeClasses(form: Pick<StationFormJson, 'characteristics'>): Record<string, string> {
  const chosen: Record<string, string> = {};
  for (const c of form.characteristics) {
    const nominal = c.rule?.nominal;
    const fits = c.sizeClasses?.find((k) => nominal != null && k.lower <= nominal && nominal <= k.upper);
    if (fits) chosen[c.code] = fits.code;
  }
  return chosen;
}
