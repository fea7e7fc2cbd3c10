import type { RunCsvReading } from '../../api/station/run-test-parse';
import { convertDecimal } from '../../../shared/domain/units';
import { slotKey, type EntryUnits, type Slot, type SlotValue } from './readings';

/**
 * Where each reading of a test stand export goes on the run-test form, apart from the screen: the
 * box (or pass/fail choice) it fills, and what the stand sent that this form has no place for.
 */

export type Fill = { slot: Slot; text: string; choice: SlotValue['choice'] };

export type FillPlan = {
  fills: Fill[];
  /** Readings with no box on this form, or in a unit the form does not record in, with why. */
  unused: { reading: RunCsvReading; why: string }[];
};

/** A value as the operator would type it: plain digits and a point, never an exponent. */
const asTyped = (value: number) =>
  Number.isInteger(value) ? String(value) : value.toFixed(6).replace(/0+$/, '').replace(/\.$/, '');

/**
 * `units`: the unit each box is being typed in (the operator's choice); a stand reading in another
 * unit of the same quantity is converted into it, as if typed so.
 */
export function planFill(slots: Slot[], readings: RunCsvReading[], units: EntryUnits = {}): FillPlan {
  const byKey = new Map(slots.map((s) => [s.key, s]));
  const fills: Fill[] = [];
  const unused: FillPlan['unused'] = [];
  for (const r of readings) {
    const slot = byKey.get(slotKey(r.characteristic, r.position));
    if (!slot) {
      unused.push({ reading: r, why: 'this form does not record it' });
      continue;
    }
    if (slot.char.kind === 'attribute') {
      if (typeof r.passed !== 'boolean') unused.push({ reading: r, why: 'a pass/fail check, but a number came' });
      else fills.push({ slot, text: '', choice: r.passed ? 'pass' : 'fail' });
      continue;
    }
    if (typeof r.value !== 'number') {
      unused.push({ reading: r, why: 'a measured value, but PASS or FAIL came' });
    } else {
      const target = units[slot.char.code] ?? slot.char.unit;
      const value = r.unit && target && r.unit !== target ? convertDecimal(r.value, r.unit, target) : null;
      if (r.unit && target && r.unit !== target && !value) {
        unused.push({ reading: r, why: `in ${r.unit}, but this form records ${target}` });
      } else {
        fills.push({ slot, text: asTyped(value ? value.toDecimalPlaces(6).toNumber() : r.value), choice: '' });
      }
    }
  }
  return { fills, unused };
}

/** Whether a fill changes what was already in the box (something typed before, now replaced). */
export function replaces(fill: Fill, before: SlotValue | undefined): boolean {
  if (fill.slot.char.kind === 'attribute') return !!before?.choice && before.choice !== fill.choice;
  const had = before?.text.trim() ?? '';
  return had !== '' && had !== fill.text;
}

/** "Compression: cylinder 4, cylinder 6" — the empty boxes of one characteristic in a line. */
export function emptyLines(empty: Slot[]): { code: string; text: string; optional: boolean }[] {
  const byChar = new Map<string, Slot[]>();
  for (const s of empty) byChar.set(s.char.code, [...(byChar.get(s.char.code) ?? []), s]);
  return [...byChar.values()].map((ss) => {
    const char = ss[0]!.char;
    const where = ss.filter((s) => s.position.code !== '').map((s) => s.position.label);
    return {
      code: char.code,
      text: where.length ? `${char.name}: ${where.join(', ')}` : char.name,
      optional: !!char.optional,
    };
  });
}

/** The name of a reading the form has no place for, as the operator would know it. */
export const unusedName = (r: RunCsvReading) => (r.position ? `${r.characteristic} (${r.position})` : r.characteristic);
