const pad = (n: number) => String(Math.abs(n)).padStart(2, '0');

/** This computer's offset from UTC on a date, as ISO 8601 writes it: "+01:00". */
export function offsetOf(d: Date): string {
  const minutes = -d.getTimezoneOffset();
  return `${minutes >= 0 ? '+' : '-'}${pad(Math.trunc(minutes / 60))}:${pad(minutes % 60)}`;
}

/**
 * A datetime-local value ("2026-12-05T08:00") is this computer's wall-clock time; the server wants
 * an instant, so it goes with the offset that applied on that date (summer time included).
 */
export function localToIso(value: string): string | null {
  if (!/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2})?$/.test(value)) return null;
  const d = new Date(value);
  if (Number.isNaN(d.getTime())) return null;
  const date = `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
  const time = `${pad(d.getHours())}:${pad(d.getMinutes())}:${pad(d.getSeconds())}`;
  return `${date}T${time}${offsetOf(d)}`;
}
