import { physicallyPossible, type Entries } from '../../../shared/domain/evaluate.js';
import { convertDecimal, unitOf } from '../../../shared/domain/units.js';
import type { SubmitResultBody } from '../../../shared/schemas/results.js';
import { invalid } from '../../errors.js';
import { lower, type FormChar } from './common.js';

/** A reading as typed, when it was typed in another unit than its characteristic's. */
export type Entered = { value: number; unit: string };

/** The largest magnitude a reading column (numeric(14, 6)) holds. */
const READING_MAX = 1e8;

/**
 * A typed value in the characteristic's unit: as is when sent in that unit (or with none), else
 * converted with the NIST SP 811 factors (shared/domain/units) and kept to the column's 6 decimals,
 * the same figure that is stored and judged. null when the unit is not of the same quantity.
 */
function inUnitOf(
  c: Pick<FormChar, 'unit'>,
  value: number,
  unit: string | undefined,
): { ok: true; value: number; entered: Entered | null } | { ok: false; message: string } | null {
  if (unit === undefined || unit === c.unit) return { ok: true, value, entered: null };
  const symbol = unitOf(unit)?.symbol;
  if (symbol === c.unit) return { ok: true, value, entered: null };
  const converted = convertDecimal(value, symbol, c.unit);
  if (!converted || !symbol) return null;
  const v = converted.toDecimalPlaces(6).toNumber();
  if (!(Math.abs(v) < READING_MAX)) return { ok: false, message: `beyond what a reading in ${c.unit} can hold` };
  return { ok: true, value: v, entered: { value, unit: symbol } };
}

/**
 * Checks what was typed against the form: every position present once, numbers for measured
 * characteristics in their unit and physical range, pass/fail for checks. All problems at once,
 * keyed `characteristic@position`.
 */
export function checkReadings(
  chars: FormChar[],
  body: SubmitResultBody,
): { entries: Entries; locations: Map<string, string>; entered: Map<string, Entered> } {
  const fields: Record<string, string> = {};
  const entries: Entries = {};
  const locations = new Map<string, string>();
  const entered = new Map<string, Entered>();
  const byCode = new Map(chars.map((c) => [c.code, c]));
  body.readings.forEach((r, i) => {
    const key = `${r.characteristic}@${r.position}`;
    const c = byCode.get(r.characteristic);
    if (!c) {
      fields[`readings.${i}.characteristic`] = `${r.characteristic} is not recorded at this stage.`;
      return;
    }
    if (c.kind === 'derived') {
      fields[key] = `${c.name} is worked out by Coretrail from the other readings: do not send it.`;
      return;
    }
    const pos = c.positions.find((p) => p.code === r.position);
    if (!pos) {
      fields[key] =
        `${r.position ? `“${r.position}”` : 'No position'} is not a position of ${lower(c.name)} on this part.`;
      return;
    }
    if (entries[c.code]?.[r.position]) {
      fields[key] = `${pos.label}: ${lower(c.name)} was sent twice.`;
      return;
    }
    let value = r.value ?? null;
    if (c.kind === 'variable') {
      const converted = r.value === undefined ? null : inUnitOf(c, r.value, r.unit);
      if (r.passed !== undefined) fields[key] = `${c.name} is measured: send a value, not pass/fail.`;
      else if (r.value === undefined) fields[key] = `${pos.label}: enter the ${lower(c.name)}.`;
      else if (!converted) {
        fields[key] =
          `${c.name} is recorded in ${c.unit}: ${r.unit || 'no unit'} is not a unit of the same quantity, so it cannot be converted.`;
      } else if (!converted.ok) {
        fields[key] = `${r.value} ${r.unit} is ${converted.message}: check the reading.`;
      } else if (!physicallyPossible(c, converted.value)) {
        const shown = converted.entered
          ? `${r.value} ${r.unit} (${converted.value} ${c.unit})`
          : `${r.value} ${c.unit ?? ''}`;
        fields[key] =
          `${shown} is not a possible ${lower(c.name)} (${c.physicalMin}–${c.physicalMax} ${c.unit ?? ''}): check the reading.`.replace(
            /\s+/g,
            ' ',
          );
      } else {
        value = converted.value;
        if (converted.entered) entered.set(key, converted.entered);
      }
    } else {
      if (r.value !== undefined) fields[key] = `${c.name} is a pass/fail check: send pass or fail, not a value.`;
      else if (r.passed === undefined) fields[key] = `${pos.label}: choose pass or fail for ${lower(c.name)}.`;
      else if (!r.passed && c.critical && !r.location) {
        fields[key] = `${c.name} failed: say where (the location field).`;
      }
    }
    (entries[c.code] ??= {})[r.position] = { value, passed: r.passed ?? null };
    if (r.location) locations.set(key, r.location);
  });
  for (const c of chars) {
    if (c.kind === 'derived' || c.optional) continue;
    for (const p of c.positions) {
      if (!entries[c.code]?.[p.code] && !fields[`${c.code}@${p.code}`]) {
        fields[`${c.code}@${p.code}`] = `Missing: ${p.label} — ${lower(c.name)}.`;
      }
    }
  }
  const problems = Object.keys(fields).length;
  if (problems) {
    throw invalid(`${problems} reading${problems > 1 ? 's need' : ' needs'} attention. Nothing was recorded.`, fields);
  }
  return { entries, locations, entered };
}
