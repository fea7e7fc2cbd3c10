import Papa from 'papaparse';

/**
 * The test stand's export, as Coretrail reads it: a CSV with the header
 * `channel,cylinder,value,unit`, one row per reading. Channels map to the run-test stage's
 * characteristics; `cylinder` is filled for per-cylinder channels only; pass/fail channels carry
 * PASS or FAIL as their value. A file that does not read cleanly is refused with the line and
 * column of its first problem, and nothing of it is used.
 */
export const RUN_CHANNELS: Record<
  string,
  { characteristic: string; unit: string | null; perCylinder: boolean; passFail?: boolean }
> = {
  OIL_P_IDLE: { characteristic: 'oil-pressure-idle', unit: 'psi', perCylinder: false },
  OIL_P_2500: { characteristic: 'oil-pressure-2500', unit: 'psi', perCylinder: false },
  COMP: { characteristic: 'compression', unit: 'psi', perCylinder: true },
  TORQUE: { characteristic: 'torque', unit: 'lbf·ft', perCylinder: false },
  RPM: { characteristic: 'speed', unit: 'rpm', perCylinder: false },
  LEAK: { characteristic: 'leak-free', unit: null, perCylinder: false, passFail: true },
  NOISE: { characteristic: 'noise-free', unit: null, perCylinder: false, passFail: true },
};

export const RUN_CSV_HEADER = ['channel', 'cylinder', 'value', 'unit'] as const;

export type RunCsvReading = {
  characteristic: string;
  position: string;
  value?: number;
  passed?: boolean;
  unit?: string;
};

export type RunCsvResult =
  { ok: true; readings: RunCsvReading[] } | { ok: false; line: number; column: number; message: string };

export function parseRunCsv(text: string, cylinders: number): RunCsvResult {
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
  const seen = new Set<string>();
  const readings: RunCsvReading[] = [];
  for (let r = 1; r < rows.length; r++) {
    const line = r + 1;
    const row = rows[r]!;
    if (row.length !== RUN_CSV_HEADER.length)
      return fail(line, Math.min(row.length, 4) + 1, `expected 4 fields, found ${row.length}.`);
    const [channel, cyl, value, unit] = row.map((c) => c.trim());
    const spec = RUN_CHANNELS[channel!.toUpperCase()];
    if (!spec) return fail(line, 1, `unknown channel “${channel}” (known: ${Object.keys(RUN_CHANNELS).join(', ')}).`);
    let position = '';
    if (spec.perCylinder) {
      const n = Number(cyl);
      if (!/^\d+$/.test(cyl!) || n < 1 || n > cylinders)
        return fail(line, 2, `cylinder “${cyl}” is not 1–${cylinders}.`);
      position = `c${n}`;
    } else if (cyl) {
      return fail(line, 2, `${channel} is measured once; leave the cylinder empty.`);
    }
    const key = `${spec.characteristic}@${position}`;
    if (seen.has(key)) return fail(line, 1, `${channel}${position ? ` for cylinder ${cyl}` : ''} appears twice.`);
    seen.add(key);
    if (spec.passFail) {
      const v = value!.toUpperCase();
      if (v !== 'PASS' && v !== 'FAIL') return fail(line, 3, `“${value}” is not PASS or FAIL.`);
      readings.push({ characteristic: spec.characteristic, position, passed: v === 'PASS' });
      continue;
    }
    if (!/^-?\d+(\.\d+)?$/.test(value!)) return fail(line, 3, `“${value}” is not a number.`);
    if (spec.unit && unit !== spec.unit) return fail(line, 4, `${channel} is in ${spec.unit}, not “${unit}”.`);
    readings.push({
      characteristic: spec.characteristic,
      position,
      value: Number(value),
      unit: spec.unit ?? undefined,
    });
  }
  return { ok: true, readings };
}
