import Decimal from 'decimal.js';
import type { Transaction } from 'sequelize';
import type { FormCharacteristic, RuleInForce } from '../../../shared/domain/evaluate.js';
import type { SizeClass, SizeClassJson } from '../../../shared/schemas/spec.js';
import { notFound } from '../../errors.js';
import { EngineFamily, type Characteristic, type ToleranceRule } from '../../models/index.js';
import type { Reference } from '../reference-cache.js';

/** Which version of a rule is in force, and the limits a reading is judged against. */

export const num = (v: unknown) => (v === null || v === undefined ? null : Number(v));

/** The version in force at `at`: approved (or since superseded) and effective then. */
export function inForceAt(rules: ToleranceRule[], at: Date): ToleranceRule | null {
  let best: ToleranceRule | null = null;
  for (const r of rules) {
    if (r.status !== 'approved' && r.status !== 'superseded') continue;
    if (!r.effectiveFrom || r.effectiveFrom > at) continue;
    if (r.supersededAt && r.supersededAt <= at) continue;
    if (!best || r.effectiveFrom > best.effectiveFrom!) best = r;
  }
  return best;
}

export function toRuleInForce(r: ToleranceRule): RuleInForce {
  return {
    id: r.id,
    version: r.version,
    limitType: r.limitType,
    nominal: num(r.nominal),
    minusTol: num(r.minusTol),
    plusTol: num(r.plusTol),
    lowerLimit: num(r.lowerLimit),
    upperLimit: num(r.upperLimit),
    unit: r.unit,
    resolution: num(r.resolution),
  };
}

/** A rule's size classes with the limits each sets (nominal − minus, nominal + plus, to the column's 6 places). */
export function sizeClassesOf(r: Pick<ToleranceRule, 'sizeClasses'>): SizeClassJson[] {
  return (r.sizeClasses ?? []).map((c) => ({
    ...c,
    lower: Number(new Decimal(c.nominal).minus(c.minusTol).toFixed(6)),
    upper: Number(new Decimal(c.nominal).plus(c.plusTol).toFixed(6)),
  }));
}

/** The rule a reading of the chosen class is judged against: the version's, with the class's limits. */
export function ruleForClass(rule: RuleInForce, c: SizeClass): RuleInForce {
  return {
    ...rule,
    limitType: 'nominal',
    nominal: c.nominal,
    minusTol: c.minusTol,
    plusTol: c.plusTol,
    lowerLimit: null,
    upperLimit: null,
  };
}

export async function familyByCode(code: string, transaction?: Transaction) {
  const family = await EngineFamily.findOne({ where: { code: code.toUpperCase() }, transaction });
  if (!family) throw notFound(`Engine family ${code}`);
  return family;
}

/** The stage's characteristics with the rules in force for a family at `at`, ready for a form. */
export function formCharacteristics(
  ref: Reference,
  stageId: number,
  familyId: number,
  at: Date,
  expand: (c: Characteristic) => FormCharacteristic['positions'],
): (FormCharacteristic & { help: string; id: number; defectCode: string | null })[] {
  return ref.characteristics(stageId).map((c) => {
    const rule = inForceAt(ref.rules(familyId, c.id), at);
    return {
      id: c.id,
      code: c.code,
      name: c.name,
      kind: c.kind,
      unit: c.unit,
      resolution: num(c.resolution),
      critical: c.critical,
      positions: expand(c),
      derivation: c.derivation,
      physicalMin: num(c.physicalMin),
      physicalMax: num(c.physicalMax),
      rule: rule ? toRuleInForce(rule) : null,
      optional: c.optional,
      help: c.help,
      defectCode: c.defectCode,
      ...(rule?.sizeClasses?.length
        ? { sizeClasses: sizeClassesOf(rule).map(({ code, name, lower, upper }) => ({ code, name, lower, upper })) }
        : {}),
    };
  });
}
