/**
 * The Western Electric run rules (Western Electric, Statistical Quality Control Handbook, 1956;
 * listed in the NIST/SEMATECH e-Handbook §6.3.2): patterns that are unlikely while a process is
 * in control, even when no point crosses a control limit.
 *
 * A rule is flagged on the point that completes its pattern, and only when that point is itself
 * one of the pattern's points, so a flag always sits on a point the reader can see is out of
 * place, and a pattern of exactly the rule's length is flagged once. "Beyond kσ" is strict: a
 * point exactly on a zone line is not beyond it, and a point on the centre line is on neither side.
 */

export type RunRule = 1 | 2 | 3 | 4;

export const RUN_RULES: readonly RunRule[] = [1, 2, 3, 4];

/** What each rule looks for, in the product's words. */
export const RUN_RULE_TEXT: Record<RunRule, string> = {
  1: 'one point beyond a control limit',
  2: 'two of three points in a row beyond 2σ on the same side',
  3: 'four of five points in a row beyond 1σ on the same side',
  4: 'eight points in a row on the same side of the centre line',
};

/** Where the zones lie: σ is the standard deviation of the plotted statistic, not of a reading. */
export type Zones = { centre: number; sigma: number; lower: number | null; upper: number | null };

/** Whether value lies beyond k σ from the centre on the given side (k = 0: on that side at all). */
function beyond(value: number, z: Zones, k: number, side: number): boolean {
  const d = (value - z.centre) * side;
  return d > 0 && d > k * z.sigma;
}

/** Does the window of `size` points ending at i hold `need` points beyond kσ on one side, i among them? */
function windowSignal(values: readonly number[], i: number, z: Zones, size: number, need: number, k: number) {
  if (i + 1 < size) return false;
  // the point that completes the pattern decides the side
  const side = Math.sign(values[i]! - z.centre);
  if (side === 0 || !beyond(values[i]!, z, k, side)) return false;
  let count = 0;
  for (let j = i - size + 1; j <= i; j++) if (beyond(values[j]!, z, k, side)) count++;
  return count >= need;
}

function breaks(rule: RunRule, values: readonly number[], i: number, z: Zones): boolean {
  switch (rule) {
    case 1: {
      const v = values[i]!;
      return (z.upper !== null && v > z.upper) || (z.lower !== null && v < z.lower);
    }
    case 2:
      return windowSignal(values, i, z, 3, 2, 2);
    case 3:
      return windowSignal(values, i, z, 5, 4, 1);
    case 4:
      return windowSignal(values, i, z, 8, 8, 0);
  }
}

/** For each point, the rules it breaks (empty when none), in rule order. */
export function runRuleFlags(
  values: readonly number[],
  zones: Zones,
  rules: readonly RunRule[] = RUN_RULES,
): RunRule[][] {
  if (!(zones.sigma >= 0)) throw new RangeError('a chart needs a non-negative σ');
  const wanted = RUN_RULES.filter((r) => rules.includes(r));
  return values.map((_, i) => {
    const broken: RunRule[] = [];
    for (const r of wanted) if (breaks(r, values, i, zones)) broken.push(r);
    return broken;
  });
}
