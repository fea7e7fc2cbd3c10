import type { Sequelize, Transaction } from 'sequelize';
import type { RuleJson, RuleLimits } from '../../../shared/schemas/spec.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { conflict, invalid, notFound } from '../../errors.js';
import { Characteristic, ToleranceRule } from '../../models/index.js';
import { presentOne } from './present.js';
import { familyByCode, num } from './rules.js';

/**
 * Drafting a rule's next version: a draft is edited or discarded freely; once approved it is never
 * edited (the database refuses too) and a change is a new draft.
 */

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

export const snapshot = (r: ToleranceRule) => ({
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

export async function lockedRule(id: number, transaction: Transaction) {
  const rule = await ToleranceRule.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!rule) throw notFound('That rule');
  return rule;
}

export function mustBeDraft(rule: ToleranceRule) {
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
