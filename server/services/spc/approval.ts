import type { Transaction } from 'sequelize';
import type { RehearsedLimits } from '../../../shared/schemas/spc.js';
import type { RuleLimits } from '../../../shared/schemas/spec.js';
import type { Ctx } from '../../audit.js';
import { conflict, invalid } from '../../errors.js';
import { RuleRehearsal, type ToleranceRule } from '../../models/index.js';

const num = (v: unknown) => (v === null || v === undefined ? null : Number(v));

export function limitsSnapshot(rule: ToleranceRule): RehearsedLimits {
  return {
    limitType: rule.limitType as RuleLimits['limitType'],
    nominal: num(rule.nominal),
    minusTol: num(rule.minusTol),
    plusTol: num(rule.plusTol),
    lowerLimit: num(rule.lowerLimit),
    upperLimit: num(rule.upperLimit),
    resolution: num(rule.resolution) ?? 0,
  };
}

export function sameLimits(a: RehearsedLimits, b: RehearsedLimits): boolean {
  const keys: (keyof RehearsedLimits)[] = [
    'limitType',
    'nominal',
    'minusTol',
    'plusTol',
    'lowerLimit',
    'upperLimit',
    'resolution',
  ];
  return keys.every((k) => (a[k] ?? null) === (b[k] ?? null));
}

/**
 * Called by the spec book's approval, in its transaction, when the approver names the rehearsal
 * they saw: it must be this draft's, of the limits being signed; it is marked as kept with the
 * approval, and its summary goes into the approval's audit event.
 */
export async function keepRehearsalWithApproval(
  _ctx: Ctx,
  transaction: Transaction,
  rule: ToleranceRule,
  rehearsalId: number,
) {
  const r = await RuleRehearsal.findByPk(rehearsalId, { transaction, lock: transaction.LOCK.UPDATE });
  if (!r || r.toleranceRuleId !== rule.id) {
    throw invalid('That rehearsal is not one of this draft.', { rehearsalId: 'Rehearse this draft first.' });
  }
  if (!sameLimits(r.ruleLimits, limitsSnapshot(rule))) {
    throw conflict('The draft changed after it was rehearsed: rehearse it again before approving.', {
      reason: 'rehearsal_stale',
    });
  }
  await r.update({ keptWithApprovalAt: new Date() }, { transaction });
  return {
    id: r.id,
    period: r.summary.period,
    counts: r.summary.counts,
    cpkBefore: r.summary.before?.cpk ?? null,
    cpkAfter: r.summary.after?.cpk ?? null,
  };
}
