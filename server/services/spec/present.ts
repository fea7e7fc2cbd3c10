import { Op, type Transaction } from 'sequelize';
import type { PositionScheme } from '../../../shared/domain/positions.js';
import { limitsOf } from '../../../shared/domain/tolerance.js';
import type { RuleJson, SpecCharacteristicJson } from '../../../shared/schemas/spec.js';
import { Signature, User, type Characteristic, type ToleranceRule } from '../../models/index.js';
import { inForceAt, num, sizeClassesOf, toRuleInForce } from './rules.js';
import { readsTogether } from '../../read/reads-together.js';

/** A rule version and a characteristic as the spec book shows them, with who drafted and signed. */

export function describeScheme(s: PositionScheme): string {
  switch (s.per) {
    case 'part':
      return 'Once per part';
    case 'cylinder':
      return ['Each cylinder', s.depths?.join(', '), s.axes?.join(', ')].filter(Boolean).join(' × ');
    case 'main':
      return ['Each main bore', s.axes?.join(', ')].filter(Boolean).join(' × ');
    case 'crankpin':
      return 'Each rod journal';
    case 'valve':
      return s.valves?.length === 1 ? `Each ${s.valves[0] === 'in' ? 'intake' : 'exhaust'} valve` : 'Each valve';
    case 'deck':
      return s.points ? `Each deck face × ${s.points} points` : 'Each deck face';
  }
}

export type Names = Map<number, string>;

export async function namesOf(ids: (number | null)[], transaction?: Transaction): Promise<Names> {
  const wanted = [...new Set(ids.filter((i): i is number => i !== null))];
  if (!wanted.length) return new Map();
  const users = await User.findAll({ where: { id: { [Op.in]: wanted } }, attributes: ['id', 'name'], transaction });
  return new Map(users.map((u) => [u.id, u.name]));
}

export async function signaturesOf(ruleIds: number[], transaction?: Transaction) {
  if (!ruleIds.length) return new Map<string, Signature>();
  const rows = await Signature.findAll({
    where: { entity: 'tolerance_rule', entityId: { [Op.in]: ruleIds.map(String) } },
    transaction,
  });
  return new Map(rows.map((s) => [s.entityId, s]));
}

export function presentRule(r: ToleranceRule, names: Names, signatures: Map<string, Signature>): RuleJson {
  const limits = r.limitType === 'attribute' ? { lower: null, upper: null } : limitsOf(toRuleInForce(r));
  const sig = signatures.get(String(r.id));
  return {
    id: r.id,
    version: r.version,
    status: r.status,
    limitType: r.limitType,
    nominal: num(r.nominal),
    minusTol: num(r.minusTol),
    plusTol: num(r.plusTol),
    lowerLimit: num(r.lowerLimit),
    upperLimit: num(r.upperLimit),
    lower: limits.lower,
    upper: limits.upper,
    unit: r.unit,
    resolution: num(r.resolution),
    sourceNote: r.sourceNote,
    sizeClasses: sizeClassesOf(r),
    effectiveFrom: r.effectiveFrom?.toISOString() ?? null,
    supersededAt: r.supersededAt?.toISOString() ?? null,
    createdBy: names.get(r.createdById) ?? '',
    createdById: r.createdById,
    createdAt: r.createdAt.toISOString(),
    approvedBy: r.approvedById ? (names.get(r.approvedById) ?? '') : null,
    approvedAt: r.approvedAt?.toISOString() ?? null,
    approvalReason: r.approvalReason,
    signature: sig
      ? { printedName: sig.printedName, meaning: sig.meaning, signedAt: sig.signedAt.toISOString() }
      : null,
  };
}

export function presentCharacteristic(
  c: Characteristic,
  rules: ToleranceRule[],
  names: Names,
  sigs: Map<string, Signature>,
  now: Date,
): SpecCharacteristicJson {
  const inForce = inForceAt(rules, now);
  const scheduled = rules.find((r) => r.status === 'approved' && r.effectiveFrom && r.effectiveFrom > now) ?? null;
  const draft = rules.find((r) => r.status === 'draft') ?? null;
  return {
    id: c.id,
    code: c.code,
    name: c.name,
    kind: c.kind,
    unit: c.unit,
    resolution: num(c.resolution),
    critical: c.critical,
    positions: c.positions,
    positionsLabel: describeScheme(c.positions),
    derivation: c.derivation,
    help: c.help,
    inForce: inForce ? presentRule(inForce, names, sigs) : null,
    scheduled: scheduled ? presentRule(scheduled, names, sigs) : null,
    draft: draft ? presentRule(draft, names, sigs) : null,
    versions: rules.filter((r) => r.status !== 'draft' && r.status !== 'withdrawn').length,
  };
}

export async function presentOne(r: ToleranceRule, transaction?: Transaction) {
  const [names, sigs] = await readsTogether(transaction, [
    () => namesOf([r.createdById, r.approvedById], transaction),
    () => signaturesOf([r.id], transaction),
  ]);
  return presentRule(r, names, sigs);
}
