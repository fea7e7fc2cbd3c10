import { evaluateForm, physicallyPossible, type Entries } from '../../../shared/domain/evaluate';
import { limitsOf } from '../../../shared/domain/tolerance';
import { alternativesOf, convertDecimal, unitInSystem, type UnitSystem } from '../../../shared/domain/units';
import type { EvaluatedReading, FormCharacteristic, Position } from '../../api/station/types';
import { formatValue } from './numbers';

/**
 * The station form's own arithmetic, apart from its screens: which boxes the operator fills, what
 * was typed in each, and how it reads against the rule. The verdicts themselves come from
 * evaluateForm, the same code the server judges with.
 */

/** One thing the operator fills in: a variable reading or a pass/fail check at one position. */
export type Slot = { index: number; key: string; char: FormCharacteristic; position: Position };

/** What is in one slot's controls (react-hook-form keeps these). */
export type SlotValue = { text: string; choice: '' | 'pass' | 'fail'; where: string };

export const slotKey = (characteristic: string, position: string) => `${characteristic}@${position}`;

/** Every position of every typed characteristic, in the order of the form (derived ones are computed). */
export function slotsOf(characteristics: FormCharacteristic[]): Slot[] {
  const out: Slot[] = [];
  for (const char of characteristics) {
    if (char.kind === 'derived') continue;
    for (const position of char.positions) {
      out.push({ index: out.length, key: slotKey(char.code, position.code), char, position });
    }
  }
  return out;
}

/** The accessible name of a reading: "Cylinder bore diameter, Cylinder 3, top, thrust". */
export const readingName = (char: Pick<FormCharacteristic, 'name'>, position: Pick<Position, 'label'>) =>
  `${char.name}, ${position.label}`;

const DECIMAL = /^[+-]?(\d+([.,]\d*)?|[.,]\d+)$/;

/** What was typed, when it was typed in another unit than the characteristic's. */
export type EnteredAs = { value: number; unit: string };

export type Typed =
  | { state: 'empty' }
  | { state: 'number'; value: number; entered?: EnteredAs }
  | { state: 'not-a-number' }
  | { state: 'impossible'; value: number; entered?: EnteredAs };

/** The unit each measured characteristic is typed in, by characteristic code; absent: its own unit. */
export type EntryUnits = Record<string, string>;

/**
 * The unit to type `char` in: the one chosen on this form, else the person's remembered one for
 * the characteristic's unit when it converts, else the characteristic's own.
 */
export function entryUnitOf(
  char: FormCharacteristic,
  chosen: EntryUnits,
  preferred: Record<string, string>,
  system?: UnitSystem,
) {
  const own = char.unit;
  if (char.kind !== 'variable' || !own) return own;
  const ok = (u: string | undefined) => !!u && (u === own || alternativesOf(own).some((a) => a.symbol === u));
  const pick = chosen[char.code];
  if (ok(pick)) return pick!;
  const pref = preferred[own];
  if (ok(pref)) return pref!;
  // nothing chosen for this unit yet: the person's unit system (inch or metric) from their profile
  return system ? unitInSystem(own, system) : own;
}

/**
 * A typed reading: a decimal point or comma both read as the decimal separator; nothing else is a
 * number. Typed in another unit (`unit`), it is converted to the characteristic's and kept to 6
 * decimals, as the server converts and stores it, so the verdict on the tablet is the server's.
 */
export function readTyped(char: FormCharacteristic, text: string, unit?: string | null): Typed {
  const t = text.trim();
  if (t === '') return { state: 'empty' };
  if (!DECIMAL.test(t)) return { state: 'not-a-number' };
  const typed = Number(t.replace(',', '.'));
  if (!Number.isFinite(typed)) return { state: 'not-a-number' };
  let value = typed;
  let entered: EnteredAs | undefined;
  if (unit && char.unit && unit !== char.unit) {
    const converted = convertDecimal(typed, unit, char.unit);
    if (!converted) return { state: 'not-a-number' };
    value = converted.toDecimalPlaces(6).toNumber();
    entered = { value: typed, unit };
  }
  const extra = entered ? { entered } : {};
  return physicallyPossible(char, value)
    ? { state: 'number', value, ...extra }
    : { state: 'impossible', value, ...extra };
}

const withUnit = (s: string, unit: string | null) => (unit ? `${s} ${unit}` : s);

/** The limits of the rule in force, as a machinist writes them: "4.0295–4.0305 in", "≤ 0.0010 in". */
export function limitsText(char: FormCharacteristic): string | null {
  const rule = char.rule;
  if (char.kind === 'attribute') return null;
  if (!rule || rule.limitType === 'attribute') return null;
  const res = rule.resolution ?? char.resolution;
  const unit = rule.unit ?? char.unit;
  const { lower, upper } = limitsOf(rule);
  const f = (v: number) => formatValue(v, res);
  if (lower !== null && upper !== null) return withUnit(`${f(lower)}–${f(upper)}`, unit);
  if (lower !== null) return withUnit(`≥ ${f(lower)}`, unit);
  if (upper !== null) return withUnit(`≤ ${f(upper)}`, unit);
  return null;
}

/** "nominal 4.0300 +0.0005 / −0.0005": only for rules written around a nominal. */
export function nominalText(char: FormCharacteristic): string | null {
  const rule = char.rule;
  if (!rule || rule.limitType !== 'nominal' || rule.nominal === null || rule.nominal === undefined) return null;
  const res = rule.resolution ?? char.resolution;
  const f = (v: number | null | undefined) => formatValue(v ?? 0, res);
  return `nominal ${f(rule.nominal)} +${f(rule.plusTol)} / −${f(rule.minusTol)}`;
}

/** Where a reading stands, for its cue under the box. */
export type Standing =
  | { kind: 'empty' }
  | { kind: 'pass' }
  | { kind: 'high'; by: number }
  | { kind: 'low'; by: number }
  | { kind: 'fail' }
  | { kind: 'not-a-number' }
  | { kind: 'impossible' };

export function standingOf(typed: Typed | null, reading: EvaluatedReading | undefined): Standing {
  if (typed?.state === 'not-a-number') return { kind: 'not-a-number' };
  if (typed?.state === 'impossible') return { kind: 'impossible' };
  if (!reading || reading.verdict === null) return { kind: 'empty' };
  if (reading.verdict === 'pass') return { kind: 'pass' };
  const r = reading.rounded;
  if (r !== null && reading.upper !== null && r > reading.upper) return { kind: 'high', by: r - reading.upper };
  if (r !== null && reading.lower !== null && r < reading.lower) return { kind: 'low', by: reading.lower - r };
  return { kind: 'fail' };
}

export type Judged = {
  /** Verdicts of every reading, typed and derived, keyed `characteristic@position`. */
  readings: Map<string, EvaluatedReading>;
  typed: Typed[];
  /** Slots the form needs that have nothing in them yet (an optional one left empty is not missing). */
  missing: Slot[];
  /** How many slots the form needs filled: every slot but those of optional characteristics. */
  required: number;
  /** Slots whose text is not a possible reading. */
  unreadable: Slot[];
  /** Readings out of tolerance (derived ones included). */
  failing: EvaluatedReading[];
};

/** Runs the shared evaluator over what is typed so far; unreadable text counts as not there yet. */
export function judge(
  characteristics: FormCharacteristic[],
  slots: Slot[],
  values: SlotValue[],
  units: EntryUnits = {},
): Judged {
  const entries: Entries = {};
  const typed: Typed[] = [];
  const missing: Slot[] = [];
  const unreadable: Slot[] = [];
  for (const slot of slots) {
    const v = values[slot.index];
    const at = (entries[slot.char.code] ??= {});
    const needed = !slot.char.optional;
    if (slot.char.kind === 'attribute') {
      const choice = v?.choice ?? '';
      typed.push({ state: 'empty' });
      if (choice === '' && needed) missing.push(slot);
      at[slot.position.code] = { passed: choice === '' ? null : choice === 'pass' };
      continue;
    }
    const t = readTyped(slot.char, v?.text ?? '', units[slot.char.code]);
    typed.push(t);
    if (t.state === 'empty' && needed) missing.push(slot);
    if (t.state === 'not-a-number' || t.state === 'impossible') unreadable.push(slot);
    at[slot.position.code] = { value: t.state === 'number' ? t.value : null };
  }
  const result = evaluateForm(characteristics, entries);
  const readings = new Map(result.readings.map((r) => [slotKey(r.characteristic, r.position), r]));
  return {
    readings,
    typed,
    missing,
    required: slots.filter((s) => !s.char.optional).length,
    unreadable,
    failing: result.readings.filter((r) => r.verdict === 'fail'),
  };
}

/** The message a slot shows under its box when it cannot be read as a reading. */
export function unreadableMessage(char: FormCharacteristic, typed: Typed): string | null {
  if (typed.state === 'not-a-number') return 'Not a number';
  if (typed.state !== 'impossible') return null;
  const unit = char.unit ? ` ${char.unit}` : '';
  const range =
    char.physicalMin !== null && char.physicalMax !== null
      ? `${char.physicalMin}–${char.physicalMax}${unit}`
      : char.physicalMin !== null
        ? `at least ${char.physicalMin}${unit}`
        : `at most ${char.physicalMax}${unit}`;
  return `Not possible: ${range}`;
}
