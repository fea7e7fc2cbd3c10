const pad = (n: number) => String(n).padStart(2, '0');

/** "2026-12-01 14:03" in the viewer's local time: unambiguous on any floor, sorts as text. */
export function formatWhen(iso: string | null | undefined, { seconds = false } = {}): string {
  if (!iso) return '—';
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  const time = `${pad(d.getHours())}:${pad(d.getMinutes())}${seconds ? `:${pad(d.getSeconds())}` : ''}`;
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())} ${time}`;
}

/** Decimals that show every value exactly (1 to 3), so a right-aligned column lines up on the point. */
export function sharedDecimals(values: number[], min = 1, max = 3): number {
  let d = min;
  for (const v of values) while (d < max && Number(v.toFixed(d)) !== v) d++;
  return d;
}

/** Thousands with a thin space, as on a drawing: 160000 → "160 000". */
export function formatGrouped(n: number): string {
  return n.toLocaleString('en-US').replace(/,/g, '\u2009');
}

export function plural(n: number, one: string, many = `${one}s`): string {
  return `${formatGrouped(n)} ${n === 1 ? one : many}`;
}
