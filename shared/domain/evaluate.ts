import Decimal from 'decimal.js';
import type { Position } from './positions.js';
import { judgeAttribute, judgeValue, type ToleranceRule, type Verdict } from './tolerance.js';

/**
 * Judging a whole station form: typed readings, the derived characteristics computed from them,
 * and each against its rule. The station screen runs this as the operator types; the server runs
 * the same code on the submitted values and is the authority.
 */

/** How a derived characteristic is computed from readings of the same result. */
export type Derivation =
  /** Largest minus smallest of the readings under the position (common shop practice). */
  | { fn: 'out_of_round'; of: string }
  /** Largest |top − bottom| over the axes measured under the position (common shop practice). */
  | { fn: 'taper'; of: string; top: string; bottom: string }
  /** outer − inner, e.g. bore − piston skirt or bearing ID − journal (common shop practice). */
  | { fn: 'clearance'; outer: string; inner: string; outerAt?: string; innerAt?: string }
  /** (highest − lowest) / highest × 100 across all positions (common practice). */
  | { fn: 'spread_pct'; of: string }
  /** Spread of point heights against a reference plane. */
  | { fn: 'flatness'; of: string }
  /** constant − value: cam advance = lobe separation on the card − measured intake centreline (common practice). */
  | { fn: 'offset'; from: number; of: string }
  /** Power from torque and speed: hp = lbf·ft × rpm / 5252.11 (derivation from 1 hp = 33 000 ft·lbf/min). */
  | { fn: 'power'; torque: string; rpm: string };

export type CharacteristicKind = 'variable' | 'attribute' | 'derived';

export type RuleInForce = ToleranceRule & { id: number; version: number };

export type FormCharacteristic = {
  code: string;
  name: string;
  kind: CharacteristicKind;
  unit: string | null;
  resolution: number | null;
  critical: boolean;
  positions: Position[];
  derivation: Derivation | null;
  physicalMin: number | null;
  physicalMax: number | null;
  rule: RuleInForce | null;
  /** May be left out; judged only when recorded. */
  optional?: boolean;
  /** The rule's size classes, each with its own limits; the station chooses one. */
  sizeClasses?: { code: string; name: string; lower: number; upper: number }[];
};

/** What was typed: characteristic code → position code → a number or a pass/fail. */
export type Entries = Record<string, Record<string, { value?: number | null; passed?: boolean | null }>>;

export type EvaluatedReading = {
  characteristic: string;
  position: string;
  value: number | null;
  passed: boolean | null;
  /** null while the reading (or a reading it is derived from) is still missing. */
  verdict: Verdict | null;
  rounded: number | null;
  lower: number | null;
  upper: number | null;
  reason: string;
  ruleId: number | null;
  ruleVersion: number | null;
};

const under = (prefix: string, code: string) => prefix === '' || code.startsWith(`${prefix}/`);

function sourceValues(values: Map<string, number>, prefix: string): [string, Decimal][] {
  return [...values.entries()].filter(([p]) => under(prefix, p)).map(([p, v]) => [p, new Decimal(v)]);
}

/**
 * The value of one derived characteristic at one position, from the values typed so far, or null
 * while any of the readings it needs is missing. Decimal arithmetic, so 4.0303 − 4.0301 is 0.0002.
 */
export function deriveValue(
  d: Derivation,
  position: string,
  expected: (charCode: string) => string[],
  typed: (charCode: string) => Map<string, number>,
): number | null {
  const complete = (code: string, prefix: string) => {
    const need = expected(code).filter((p) => under(prefix, p));
    const got = typed(code);
    return need.length > 0 && need.every((p) => got.has(p));
  };
  switch (d.fn) {
    case 'out_of_round':
    case 'flatness': {
      if (!complete(d.of, position)) return null;
      const vs = sourceValues(typed(d.of), position).map(([, v]) => v);
      return Decimal.max(...vs)
        .minus(Decimal.min(...vs))
        .toNumber();
    }
    case 'spread_pct': {
      if (!complete(d.of, position)) return null;
      const vs = sourceValues(typed(d.of), position).map(([, v]) => v);
      const hi = Decimal.max(...vs);
      if (hi.lte(0)) return null;
      return hi
        .minus(Decimal.min(...vs))
        .div(hi)
        .times(100)
        .toNumber();
    }
    case 'taper': {
      if (!complete(d.of, position)) return null;
      const byAxis = new Map<string, { top?: Decimal; bottom?: Decimal }>();
      for (const [p, v] of sourceValues(typed(d.of), position)) {
        const rest = (position ? p.slice(position.length + 1) : p).split('/');
        const [depth, axis = ''] = rest;
        const slot = byAxis.get(axis) ?? {};
        if (depth === d.top) slot.top = v;
        if (depth === d.bottom) slot.bottom = v;
        byAxis.set(axis, slot);
      }
      const tapers = [...byAxis.values()]
        .filter((s): s is { top: Decimal; bottom: Decimal } => !!s.top && !!s.bottom)
        .map((s) => s.top.minus(s.bottom).abs());
      return tapers.length ? Decimal.max(...tapers).toNumber() : null;
    }
    case 'offset': {
      const v = typed(d.of).get(position);
      return v === undefined ? null : new Decimal(d.from).minus(v).toNumber();
    }
    case 'power': {
      const t = typed(d.torque).get(position);
      const n = typed(d.rpm).get(position);
      if (t === undefined || n === undefined) return null;
      return new Decimal(t)
        .times(n)
        .div(new Decimal(33_000).div(new Decimal(2).times(Math.PI)))
        .toNumber();
    }
    case 'clearance': {
      const at = (base: string, suffix?: string) => [base, suffix].filter(Boolean).join('/');
      const outer = typed(d.outer).get(at(position, d.outerAt));
      const inner = typed(d.inner).get(at(position, d.innerAt));
      if (outer === undefined || inner === undefined) return null;
      return new Decimal(outer).minus(inner).toNumber();
    }
  }
}

function judged(
  c: FormCharacteristic,
  position: string,
  value: number | null,
  passed: boolean | null,
): EvaluatedReading {
  const base = {
    characteristic: c.code,
    position,
    value,
    passed,
    ruleId: c.rule?.id ?? null,
    ruleVersion: c.rule?.version ?? null,
  };
  if (c.kind === 'attribute') {
    if (passed === null) {
      return { ...base, verdict: null, rounded: null, lower: null, upper: null, reason: 'not recorded yet' };
    }
    const j = judgeAttribute(passed);
    return { ...base, verdict: j.verdict, rounded: null, lower: null, upper: null, reason: j.reason };
  }
  if (value === null || !c.rule) {
    return {
      ...base,
      verdict: null,
      rounded: null,
      lower: null,
      upper: null,
      reason: !c.rule ? 'no approved rule in force' : 'not recorded yet',
    };
  }
  const j = judgeValue(value, {
    ...c.rule,
    unit: c.rule.unit ?? c.unit,
    resolution: c.rule.resolution ?? c.resolution,
  });
  return { ...base, verdict: j.verdict, rounded: j.rounded, lower: j.lower, upper: j.upper, reason: j.reason };
}

/**
 * Every reading of a form, typed and derived, with its verdict so far. The overall verdict is
 * `fail` as soon as one reading fails, `pass` once every reading is judged and passes, and null
 * while anything is still missing.
 */
export function evaluateForm(
  characteristics: FormCharacteristic[],
  entries: Entries,
): { readings: EvaluatedReading[]; verdict: Verdict | null; missing: number } {
  const byCode = new Map(characteristics.map((c) => [c.code, c]));
  const typedCache = new Map<string, Map<string, number>>();
  const typed = (code: string) => {
    let m = typedCache.get(code);
    if (!m) {
      m = new Map();
      for (const [p, e] of Object.entries(entries[code] ?? {})) {
        if (typeof e.value === 'number' && Number.isFinite(e.value)) m.set(p, e.value);
      }
      typedCache.set(code, m);
    }
    return m;
  };
  const expected = (code: string) => byCode.get(code)?.positions.map((p) => p.code) ?? [];

  const readings: EvaluatedReading[] = [];
  for (const c of characteristics) {
    for (const p of c.positions) {
      if (c.kind === 'derived') {
        const v = c.derivation ? deriveValue(c.derivation, p.code, expected, typed) : null;
        readings.push(judged(c, p.code, v, null));
      } else if (c.kind === 'attribute') {
        const e = entries[c.code]?.[p.code];
        readings.push(judged(c, p.code, null, typeof e?.passed === 'boolean' ? e.passed : null));
      } else {
        const v = typed(c.code).get(p.code) ?? null;
        readings.push(judged(c, p.code, v, null));
      }
    }
  }
  const optional = new Set(characteristics.filter((c) => c.optional).map((c) => c.code));
  // an optional characteristic left out is simply not recorded
  const kept = readings.filter(
    (r) => !(optional.has(r.characteristic) && r.verdict === null && r.value === null && r.passed === null),
  );
  const missing = kept.filter((r) => r.verdict === null).length;
  const verdict = kept.some((r) => r.verdict === 'fail') ? 'fail' : missing === 0 ? 'pass' : null;
  return { readings: kept, verdict, missing };
}

/** Whether a typed value is physically possible for the characteristic (a typing slip otherwise). */
export function physicallyPossible(c: Pick<FormCharacteristic, 'physicalMin' | 'physicalMax'>, value: number) {
  if (!Number.isFinite(value)) return false;
  if (c.physicalMin !== null && value < c.physicalMin) return false;
  if (c.physicalMax !== null && value > c.physicalMax) return false;
  return true;
}
