/** Figures at a fixed number of decimals, with a true minus sign; empty for a missing value. */
export function fixed(v: number | null | undefined, digits: number): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  const s = (Math.abs(v) < 0.5 * 10 ** -digits ? 0 : v).toFixed(digits);
  return s.startsWith('-') ? `−${s.slice(1)}` : s;
}

/** Decimals of a step such as 0.0001 (4); a mean gets one more than its readings. */
export function decimalsOf(step: number | null | undefined): number {
  if (!step || !(step > 0)) return 4;
  return Math.max(0, Math.min(8, Math.ceil(-Math.log10(step) - 1e-9)));
}

/** An index such as Cpk: two decimals, as the trade reads them. */
export const index2 = (v: number | null | undefined) => fixed(v, 2);
