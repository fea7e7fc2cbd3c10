// apart from readings.ts, which brings the evaluator and decimal.js: the verdict panel needs only these

/** Decimals a unit of the resolution needs: 0.0001 → 4, 0.5 → 1, 1 → 0. */
export function decimalsOf(resolution: number | null | undefined): number | null {
  if (!resolution || resolution <= 0) return null;
  const s = String(resolution);
  if (s.includes('e-')) return Number(s.split('e-')[1]);
  return s.includes('.') ? s.split('.')[1]!.length : 0;
}

export function formatValue(value: number, resolution: number | null | undefined): string {
  const d = decimalsOf(resolution);
  const s = d === null ? String(value) : value.toFixed(d);
  return s.replace('-', '−');
}
