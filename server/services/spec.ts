import Decimal from 'decimal.js';
import { Op, type Sequelize, type Transaction } from 'sequelize';
import type { FormCharacteristic, RuleInForce } from '../../shared/domain/evaluate.js';
import type { PositionScheme } from '../../shared/domain/positions.js';
import { limitsOf } from '../../shared/domain/tolerance.js';
import type {
  RuleHistoryJson,
  RuleJson,
  RuleLimits,
  SizeClass,
  SizeClassJson,
  SpecBookJson,
  SpecCharacteristicJson,
} from '../../shared/schemas/spec.js';
import { recordAudit, type Ctx } from '../audit.js';
import { conflict, forbidden, invalid, notFound } from '../errors.js';
import { Characteristic, EngineFamily, Signature, Stage, ToleranceRule, User } from '../models/index.js';
import type { Reference } from './reference-cache.js';
import { signWithPassword } from './signatures.js';
import { keepRehearsalWithApproval } from './spc/approval.js';

/**
 * The spec book. A rule is drafted, then approved with the approver's signature (their password
 * re-entered), which makes it effective from a time and supersedes the version in force then.
 * Approved versions are never edited (the database refuses too); readings keep the version used.
 */

const num = (v: unknown) => (v === null || v === undefined ? null : Number(v));

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

type Names = Map<number, string>;

async function namesOf(ids: (number | null)[], transaction?: Transaction): Promise<Names> {
  const wanted = [...new Set(ids.filter((i): i is number => i !== null))];
  if (!wanted.length) return new Map();
  const users = await User.findAll({ where: { id: { [Op.in]: wanted } }, attributes: ['id', 'name'], transaction });
  return new Map(users.map((u) => [u.id, u.name]));
}

async function signaturesOf(ruleIds: number[], transaction?: Transaction) {
  if (!ruleIds.length) return new Map<string, Signature>();
  const rows = await Signature.findAll({
    where: { entity: 'tolerance_rule', entityId: { [Op.in]: ruleIds.map(String) } },
    transaction,
  });
  return new Map(rows.map((s) => [s.entityId, s]));
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

function presentCharacteristic(
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

export async function familyByCode(code: string, transaction?: Transaction) {
  const family = await EngineFamily.findOne({ where: { code: code.toUpperCase() }, transaction });
  if (!family) throw notFound(`Engine family ${code}`);
  return family;
}

/** One family's whole spec book, stage by stage, in four queries whatever its size. */
export async function specBook(familyCode: string): Promise<SpecBookJson> {
  const family = await familyByCode(familyCode);
  const [stages, characteristics, rules] = await Promise.all([
    Stage.findAll({ order: [['id', 'ASC']] }),
    Characteristic.findAll({
      order: [
        ['sortOrder', 'ASC'],
        ['id', 'ASC'],
      ],
    }),
    ToleranceRule.findAll({ where: { engineFamilyId: family.id }, order: [['version', 'ASC']] }),
  ]);
  const [names, sigs] = await Promise.all([
    namesOf(rules.flatMap((r) => [r.createdById, r.approvedById])),
    signaturesOf(rules.map((r) => r.id)),
  ]);
  const now = new Date();
  const rulesOf = new Map<number, ToleranceRule[]>();
  for (const r of rules) rulesOf.set(r.characteristicId, [...(rulesOf.get(r.characteristicId) ?? []), r]);
  return {
    family: { id: family.id, code: family.code, name: family.name },
    stages: stages
      .map((s) => ({
        code: s.code,
        name: s.name,
        partKind: s.partKind,
        characteristics: characteristics
          .filter((c) => c.stageId === s.id)
          .map((c) => presentCharacteristic(c, rulesOf.get(c.id) ?? [], names, sigs, now)),
      }))
      .filter((s) => s.characteristics.length > 0),
  };
}

export async function ruleHistory(familyCode: string, characteristicId: number): Promise<RuleHistoryJson> {
  const family = await familyByCode(familyCode);
  const c = await Characteristic.findByPk(characteristicId, { include: [{ model: Stage, as: 'stage' }] });
  if (!c) throw notFound('That characteristic');
  const rules = await ToleranceRule.findAll({
    where: { engineFamilyId: family.id, characteristicId },
    order: [['version', 'DESC']],
  });
  const [names, sigs] = await Promise.all([
    namesOf(rules.flatMap((r) => [r.createdById, r.approvedById])),
    signaturesOf(rules.map((r) => r.id)),
  ]);
  const stage = (c as Characteristic & { stage: Stage }).stage;
  return {
    family: { id: family.id, code: family.code, name: family.name },
    characteristic: presentCharacteristic(c, [...rules].reverse(), names, sigs, new Date()),
    stage: { code: stage.code, name: stage.name },
    versions: rules.map((r) => presentRule(r, names, sigs)),
  };
}

async function presentOne(r: ToleranceRule, transaction?: Transaction) {
  const [names, sigs] = await Promise.all([
    namesOf([r.createdById, r.approvedById], transaction),
    signaturesOf([r.id], transaction),
  ]);
  return presentRule(r, names, sigs);
}

const limitColumns = (l: RuleLimits) => ({
  limitType: l.limitType,
  nominal: l.limitType === 'nominal' ? l.nominal : null,
  minusTol: l.limitType === 'nominal' ? l.minusTol : null,
  plusTol: l.limitType === 'nominal' ? l.plusTol : null,
  lowerLimit: l.limitType === 'range' || l.limitType === 'min' ? l.lowerLimit : null,
  upperLimit: l.limitType === 'range' || l.limitType === 'max' ? l.upperLimit : null,
  resolution: l.resolution,
  sourceNote: l.sourceNote,
  sizeClasses: l.sizeClasses,
});

const snapshot = (r: ToleranceRule) => ({
  version: r.version,
  status: r.status,
  ...limitColumns({
    limitType: r.limitType as RuleLimits['limitType'],
    nominal: num(r.nominal),
    minusTol: num(r.minusTol),
    plusTol: num(r.plusTol),
    lowerLimit: num(r.lowerLimit),
    upperLimit: num(r.upperLimit),
    resolution: num(r.resolution) ?? 0,
    sourceNote: r.sourceNote,
    sizeClasses: r.sizeClasses ?? [],
  }),
  unit: r.unit,
  effectiveFrom: r.effectiveFrom,
  supersededAt: r.supersededAt,
});

/** Starts the next version of a rule as a draft. One draft at a time per family and characteristic. */
export async function createDraft(
  sequelize: Sequelize,
  ctx: Ctx,
  familyCode: string,
  characteristicId: number,
  limits: RuleLimits,
): Promise<RuleJson> {
  return sequelize.transaction(async (transaction) => {
    const family = await familyByCode(familyCode, transaction);
    const c = await Characteristic.findByPk(characteristicId, { transaction });
    if (!c) throw notFound('That characteristic');
    if (c.retiredAt) {
      throw conflict(`${c.name} is retired: no rule can be drafted for it.`, { characteristicId: c.id });
    }
    if (c.kind === 'attribute') {
      throw invalid(`${c.name} is a pass/fail check: it has no limits to set.`, { characteristicId: 'Pass/fail.' });
    }
    // serialises drafting per family × characteristic, so two drafts cannot take the same version
    await sequelize.query('SELECT pg_advisory_xact_lock(:a, :b)', {
      replacements: { a: family.id, b: c.id },
      transaction,
    });
    const existing = await ToleranceRule.findOne({
      where: { engineFamilyId: family.id, characteristicId: c.id, status: 'draft' },
      transaction,
    });
    if (existing) {
      throw conflict(`Version ${existing.version} of this rule is already a draft: edit it, or discard it first.`, {
        draftId: existing.id,
      });
    }
    const last = (await ToleranceRule.max<number, ToleranceRule>('version', {
      where: { engineFamilyId: family.id, characteristicId: c.id },
      transaction,
    })) as number | null;
    const rule = await ToleranceRule.create(
      {
        engineFamilyId: family.id,
        characteristicId: c.id,
        version: (last ?? 0) + 1,
        status: 'draft',
        ...limitColumns(limits),
        unit: c.unit,
        effectiveFrom: null,
        supersededAt: null,
        createdById: ctx.actor!.id,
        approvedById: null,
        approvedAt: null,
        approvalReason: null,
      },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'spec.draft_created',
      entity: 'tolerance_rule',
      entityId: rule.id,
      after: { family: family.code, characteristic: c.code, ...snapshot(rule) },
    });
    return presentOne(rule, transaction);
  });
}

async function lockedRule(id: number, transaction: Transaction) {
  const rule = await ToleranceRule.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!rule) throw notFound('That rule');
  return rule;
}

function mustBeDraft(rule: ToleranceRule) {
  if (rule.status !== 'draft') {
    throw conflict(
      `Version ${rule.version} is ${rule.status === 'withdrawn' ? 'a discarded draft' : 'approved'}: an approved rule is never edited. Start a new draft instead.`,
    );
  }
}

export async function updateDraft(sequelize: Sequelize, ctx: Ctx, id: number, limits: RuleLimits) {
  return sequelize.transaction(async (transaction) => {
    const rule = await lockedRule(id, transaction);
    mustBeDraft(rule);
    const before = snapshot(rule);
    await rule.update(limitColumns(limits), { transaction });
    await recordAudit(ctx, transaction, {
      action: 'spec.draft_edited',
      entity: 'tolerance_rule',
      entityId: rule.id,
      before,
      after: snapshot(rule),
    });
    return presentOne(rule, transaction);
  });
}

/** A discarded draft stays as a record ("withdrawn"); its version number is not reused. */
export async function discardDraft(sequelize: Sequelize, ctx: Ctx, id: number) {
  return sequelize.transaction(async (transaction) => {
    const rule = await lockedRule(id, transaction);
    mustBeDraft(rule);
    await rule.update({ status: 'withdrawn' }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'spec.draft_discarded',
      entity: 'tolerance_rule',
      entityId: rule.id,
      before: { status: 'draft' },
      after: { status: 'withdrawn' },
    });
    return presentOne(rule, transaction);
  });
}

/**
 * Approves a draft with the approver's electronic signature. The version in force at the effective
 * time is marked superseded from then; readings taken before keep pointing at it.
 */
export async function approveRule(
  sequelize: Sequelize,
  ctx: Ctx,
  id: number,
  input: { reason: string; password: string; effectiveFrom?: string; rehearsalId?: number },
): Promise<RuleJson> {
  return sequelize.transaction(async (transaction) => {
    const rule = await lockedRule(id, transaction);
    mustBeDraft(rule);
    // separation of duties: the person who wrote the limits is not the one who signs them off
    if (rule.createdById === ctx.actor!.id) {
      throw forbidden('You drafted this version: another quality engineer must approve it.');
    }
    const rehearsal = input.rehearsalId
      ? await keepRehearsalWithApproval(ctx, transaction, rule, input.rehearsalId)
      : null;
    const now = new Date();
    const effectiveFrom = input.effectiveFrom ? new Date(input.effectiveFrom) : now;
    // a minute's grace for the clock of the approver's computer
    if (effectiveFrom.getTime() < now.getTime() - 60_000) {
      throw invalid('A rule cannot take effect in the past: results already judged keep their version.', {
        effectiveFrom: 'Choose now or a later time.',
      });
    }
    const effective = effectiveFrom < now ? now : effectiveFrom;
    const others = await ToleranceRule.findAll({
      where: {
        engineFamilyId: rule.engineFamilyId,
        characteristicId: rule.characteristicId,
        status: { [Op.in]: ['approved'] },
      },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    const pending = others.find((r) => r.effectiveFrom && r.effectiveFrom > now);
    if (pending) {
      throw conflict(
        `Version ${pending.version} is already approved to take effect on ${pending.effectiveFrom!.toISOString()}. Only one version can wait to take effect.`,
      );
    }
    const family = (await EngineFamily.findByPk(rule.engineFamilyId, { transaction }))!;
    const c = (await Characteristic.findByPk(rule.characteristicId, { transaction }))!;
    const meaning = `Approved ${family.code} ${c.name}, version ${rule.version}`;
    const { user: approver } = await signWithPassword(ctx, transaction, {
      entity: 'tolerance_rule',
      entityId: String(rule.id),
      meaning,
      reason: input.reason,
      password: input.password,
      refused: 'the rule was not approved.',
    });
    for (const old of others) {
      const before = { status: old.status, supersededAt: old.supersededAt };
      await old.update({ status: 'superseded', supersededAt: effective }, { transaction });
      await recordAudit(ctx, transaction, {
        action: 'spec.rule_superseded',
        entity: 'tolerance_rule',
        entityId: old.id,
        before,
        after: { status: 'superseded', supersededAt: effective, byVersion: rule.version },
      });
    }
    const before = snapshot(rule);
    await rule.update(
      {
        status: 'approved',
        effectiveFrom: effective,
        approvedById: approver.id,
        approvedAt: now,
        approvalReason: input.reason,
      },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'spec.rule_approved',
      entity: 'tolerance_rule',
      entityId: rule.id,
      before,
      after: {
        family: family.code,
        characteristic: c.code,
        ...snapshot(rule),
        reason: input.reason,
        signature: { printedName: approver.name, meaning, signedAt: now.toISOString() },
        ...(rehearsal ? { rehearsal } : {}),
      },
    });
    return presentOne(rule, transaction);
  });
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
