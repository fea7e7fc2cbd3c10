import Papa from 'papaparse';
import { sameQuantity } from './units.js';

/**
 * The test stand's export, as Coretrail reads it: a CSV with the header
 * `channel,cylinder,value,unit`, one row per reading. A channel names a characteristic of the run
 * test stage: by its code (any case), or by one of the stand channel names below where the stage
 * has that characteristic. `cylinder` is filled for per-cylinder characteristics only; pass/fail
 * checks carry PASS or FAIL as their value; a value may be in another unit of its quantity (the
 * station converts it). A file that does not read cleanly is refused with the line and column of
 * its first problem, and nothing of it is used.
 */
export const STAND_CHANNELS: Record<string, string> = {
  OIL_P_IDLE: 'oil-pressure-idle',
  OIL_P_2500: 'oil-pressure-2500',
  COMP: 'compression',
  TORQUE: 'torque',
  RPM: 'speed',
  LEAK: 'leak-free',
  NOISE: 'noise-free',
};

export const RUN_CSV_HEADER = ['channel', 'cylinder', 'value', 'unit'] as const;

/** A characteristic of the run-test stage, with its positions on this unit. */
export type RunCsvChar = {
  code: string;
  name: string;
  kind: 'variable' | 'attribute' | 'derived';
  unit: string | null;
  positions: { code: string; cylinder?: number }[];
};

export type RunCsvReading = {
  characteristic: string;
  position: string;
  value?: number;
  passed?: boolean;
  unit?: string;
};

export type RunCsvResult =
  { ok: true; readings: RunCsvReading[] } | { ok: false; line: number; column: number; message: string };

/** The characteristic a channel names: its own code first, then the stand's channel names. */
function charOf(chars: RunCsvChar[], channel: string): RunCsvChar | undefined {
  const upper = channel.toUpperCase();
  const own = chars.find((c) => c.code.toUpperCase() === upper);
  if (own) return own;
  const alias = STAND_CHANNELS[upper];
  return alias ? chars.find((c) => c.code === alias) : undefined;
}

/** Where a row's cylinder puts its reading, or why it cannot go anywhere. */
function positionOf(
  c: RunCsvChar,
  channel: string,
  cyl: string,
  cylinders: number,
): { code: string } | { why: string; column: number } {
  const perCylinder = c.positions.filter((p) => p.cylinder !== undefined);
  if (!perCylinder.length) {
    if (cyl) return { why: `${channel} is measured once; leave the cylinder empty.`, column: 2 };
    if (c.positions.length !== 1)
      return {
        why: `${c.name} is read at ${c.positions.length} places; the stand's file cannot say which.`,
        column: 1,
      };
    return { code: c.positions[0]!.code };
  }
  const n = Number(cyl);
  if (!/^\d+$/.test(cyl) || n < 1 || n > cylinders)
    return { why: `cylinder “${cyl}” is not 1–${cylinders}.`, column: 2 };
  const at = perCylinder.filter((p) => p.cylinder === n);
  if (at.length !== 1)
    return {
      why: `${c.name} is read at ${at.length} places per cylinder; the stand's file cannot say which.`,
      column: 1,
    };
  return { code: at[0]!.code };
}

export function parseRunCsv(text: string, chars: RunCsvChar[], cylinders: number): RunCsvResult {
  const parsed = Papa.parse<string[]>(text.replace(/^\ufeff/, ''), { skipEmptyLines: 'greedy' });
  const fail = (line: number, column: number, message: string): RunCsvResult => ({
    ok: false,
    line,
    column,
    message: `Line ${line}, column ${column}: ${message}`,
  });
  if (parsed.errors.length) {
    const e = parsed.errors[0]!;
    return fail((e.row ?? 0) + 1, 1, e.message);
  }
  const rows = parsed.data;
  if (!rows.length) return fail(1, 1, 'the file is empty.');
  const header = rows[0]!.map((h) => h.trim().toLowerCase());
  for (const [i, name] of RUN_CSV_HEADER.entries()) {
    if (header[i] !== name)
      return fail(1, i + 1, `expected the header “${RUN_CSV_HEADER.join(',')}”, found “${rows[0]!.join(',')}”.`);
  }
  const readable = chars.filter((c) => c.kind !== 'derived').map((c) => c.code);
  const seen = new Set<string>();
  const readings: RunCsvReading[] = [];
  for (let r = 1; r < rows.length; r++) {
    const line = r + 1;
    const row = rows[r]!;
    if (row.length !== RUN_CSV_HEADER.length)
      return fail(line, Math.min(row.length, 4) + 1, `expected 4 fields, found ${row.length}.`);
    const [channel, cyl, value, unit] = row.map((c) => c.trim()) as [string, string, string, string];
    const c = charOf(chars, channel);
    if (!c) return fail(line, 1, `unknown channel “${channel}” (this run test reads: ${readable.join(', ')}).`);
    if (c.kind === 'derived') return fail(line, 1, `${c.name} is worked out by Coretrail, not read from the stand.`);
    const at = positionOf(c, channel, cyl, cylinders);
    if ('why' in at) return fail(line, at.column, at.why);
    const key = `${c.code}@${at.code}`;
    if (seen.has(key)) return fail(line, 1, `${channel}${cyl ? ` for cylinder ${cyl}` : ''} appears twice.`);
    seen.add(key);
    if (c.kind === 'attribute') {
      const v = value.toUpperCase();
      if (v !== 'PASS' && v !== 'FAIL') return fail(line, 3, `“${value}” is not PASS or FAIL.`);
      readings.push({ characteristic: c.code, position: at.code, passed: v === 'PASS' });
      continue;
    }
    if (!/^-?\d+(\.\d+)?$/.test(value)) return fail(line, 3, `“${value}” is not a number.`);
    if (c.unit && unit && unit !== c.unit && !sameQuantity(unit, c.unit))
      return fail(line, 4, `${channel} is in ${c.unit} (or another unit of its quantity), not “${unit}”.`);
    const given = c.unit ? unit || c.unit : undefined;
    readings.push({
      characteristic: c.code,
      position: at.code,
      value: Number(value),
      ...(given ? { unit: given } : {}),
    });
  }
  return { ok: true, readings };
}
