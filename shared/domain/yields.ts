/**
 * First-pass and rolled throughput yield. FPY of a step = units that passed it at their first
 * attempt / units that attempted it; RTY = the product of the steps' FPYs (the chance that a unit
 * goes through every step without a single failure).
 */
export type StepCount = { entered: number; firstPass: number };

export function fpy({ entered, firstPass }: StepCount): number | null {
  if (!Number.isInteger(entered) || !Number.isInteger(firstPass) || entered < 0 || firstPass < 0) {
    throw new RangeError('Counts are whole numbers, not negative.');
  }
  if (firstPass > entered) throw new RangeError('More first passes than units entering.');
  return entered === 0 ? null : firstPass / entered;
}

/** Steps nobody entered carry no evidence and are left out; no step with evidence at all gives null. */
export function rty(steps: StepCount[]): number | null {
  const yields = steps.map(fpy).filter((y): y is number => y !== null);
  return yields.length === 0 ? null : yields.reduce((a, b) => a * b, 1);
}

/** Shares of a Pareto: most first (ties by key), with each row's cumulative share in per cent. */
export function paretoOrder<T extends { key: string; count: number }>(rows: T[]): (T & { cumulativePct: number })[] {
  const sorted = [...rows].sort((a, b) => b.count - a.count || a.key.localeCompare(b.key));
  const total = sorted.reduce((s, r) => s + r.count, 0);
  let running = 0;
  return sorted.map((r) => {
    running += r.count;
    return { ...r, cumulativePct: total === 0 ? 0 : Math.round((running / total) * 1000) / 10 };
  });
}
