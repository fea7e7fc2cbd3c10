import { formatNumber } from '../../lib/i18n';

// apart from readings.ts, which brings the evaluator and decimal.js: the verdict panel needs only these

/** Decimals a unit of the resolution needs: 0.0001 → 4, 0.5 → 1, 1 → 0. */
export function decimalsOf(resolution: number | null | undefined): number | null {
  if (!resolution || resolution <= 0) return null;
  const s = String(resolution);
  if (s.includes('e-')) return Number(s.split('e-')[1]);
  return s.includes('.') ? s.split('.')[1]!.length : 0;
}

/**
 * A reading or limit to its resolution's decimals, with the decimal sign of the screen's language
 * (a comma in Spanish); never grouped, so it reads as it is typed.
 */
export function formatValue(value: number, resolution: number | null | undefined): string {
  const d = decimalsOf(resolution);
  const s = formatNumber(value, {
    useGrouping: false,
    ...(d === null ? { maximumFractionDigits: 20 } : { minimumFractionDigits: d, maximumFractionDigits: d }),
  });
  return s.replace('-', '−');
}
