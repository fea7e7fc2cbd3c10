import { Op, type Sequelize } from 'sequelize';
import type { RuleJson } from '../../../shared/schemas/spec.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { conflict, forbidden, invalid } from '../../errors.js';
import { Characteristic, EngineFamily, ToleranceRule } from '../../models/index.js';
import { signWithPassword } from '../signatures.js';
import { keepRehearsalWithApproval } from '../spc/approval.js';
import { lockedRule, mustBeDraft, snapshot } from './drafts.js';
import { presentOne } from './present.js';

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
