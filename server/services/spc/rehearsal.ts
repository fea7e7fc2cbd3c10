import type { Sequelize } from 'sequelize';
import { rehearseParts, type Capability } from '../../../shared/domain/spc/index.js';
import { limitsOf } from '../../../shared/domain/tolerance.js';
import {
  periodBounds,
  REHEARSAL_LIST_LIMIT,
  type RehearsalIndices,
  type RehearsalJson,
  type RehearsalSummary,
  type RehearseBody,
} from '../../../shared/schemas/spc.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { conflict, notFound } from '../../errors.js';
import { EngineFamily, RuleRehearsal, ToleranceRule } from '../../models/index.js';
import { inForceAt, toRuleInForce } from '../spec/rules.js';
import { limitsSnapshot, sameLimits } from './approval.js';
import { limitsFor, limitsInForce, namesById } from './limits.js';
import { rehearsalReadings, shippedUnitsHolding } from './readings.js';
import { resolveScope } from './scope.js';
import { linesOf } from './series.js';

/**
 * Rehearsing a draft rule: the stored readings of a period judged again against the draft by the
 * station's own judge (shared/domain/spc/rehearse.ts), each part as it left the stage (its newest
 * current result in the period). The summary — flips each way, Cpk before and after, the shipped
 * units that hold a part that would now fail — is stored as a record of its own, audited, and the
 * one the approver saw is kept with the approval.
 */

function indices(c: Capability | null): RehearsalIndices | null {
  if (!c) return null;
  return {
    cp: c.within?.potential ?? null,
    cpk: c.within?.index ?? null,
    cpkLower: c.within?.interval.lower ?? null,
    cpkUpper: c.within?.interval.upper ?? null,
    ppk: c.overall?.index ?? null,
  };
}

function isStale(r: RuleRehearsal, rule: ToleranceRule) {
  return !sameLimits(r.ruleLimits, limitsSnapshot(rule));
}

function present(r: RuleRehearsal, rule: ToleranceRule, runBy: string): RehearsalJson {
  return {
    id: r.id,
    ruleId: r.toleranceRuleId,
    runBy,
    runAt: r.createdAt.toISOString(),
    stale: isStale(r, rule),
    keptWithApprovalAt: r.keptWithApprovalAt?.toISOString() ?? null,
    summary: r.summary,
  };
}

export async function rehearseDraft(
  sequelize: Sequelize,
  ctx: Ctx,
  ruleId: number,
  body: RehearseBody,
): Promise<RehearsalJson> {
  const rule = await ToleranceRule.findByPk(ruleId);
  if (!rule) throw notFound('That rule');
  if (rule.status !== 'draft') {
    throw conflict(`Version ${rule.version} is not a draft: only a draft is rehearsed before it is signed.`);
  }
  const family = (await EngineFamily.findByPk(rule.engineFamilyId))!;
  const s = await resolveScope(sequelize, {
    family: family.code,
    characteristicId: rule.characteristicId,
    station: body.station,
    gauge: body.gauge,
  });
  const period = periodBounds(body.from, body.to);
  const judged = await judgeAgainstDraft(sequelize, rule, s, period);
  const summary = await summarise(sequelize, rule, s, period, judged);
  const row = await storeRehearsal(sequelize, ctx, { rule, s, period, summary });
  const name = ctx.actor!.name ?? (await namesById([ctx.actor!.id])).get(ctx.actor!.id) ?? '';
  return present(row, rule, name);
}

type Scope = Awaited<ReturnType<typeof resolveScope>>;
type Period = ReturnType<typeof periodBounds>;
type Judged = Awaited<ReturnType<typeof judgeAgainstDraft>>;

/** The period's parts judged again by the draft and by the version in force now. */
async function judgeAgainstDraft(sequelize: Sequelize, rule: ToleranceRule, s: Scope, period: Period) {
  const parts = await rehearsalReadings(sequelize, {
    familyId: s.family.id,
    characteristicId: s.characteristic.id,
    ...period,
    stationId: s.station?.id,
    gaugeId: s.gauge?.id,
  });
  const current = inForceAt(s.ref.rules(s.family.id, s.characteristic.id), new Date());
  const frozen = limitsFor(
    await limitsInForce(sequelize, s.ref),
    s.family.id,
    s.characteristic.id,
    s.station?.id ?? null,
  );
  const sigmaWithin = frozen ? linesOf(frozen.limits).sigmaWithin : null;
  const draft = toRuleInForce(rule);
  const r = rehearseParts({
    parts: parts.map((p) => ({
      partId: String(p.itemId),
      positions: p.positions,
      values: p.vals,
      verdicts: p.verdicts,
    })),
    rule: draft,
    current: current ? toRuleInForce(current) : null,
    resolution: s.characteristic.resolution === null ? null : Number(s.characteristic.resolution),
    unit: s.characteristic.unit,
    sigmaWithin: sigmaWithin || null,
  });
  return { parts, current, sigmaWithin, draft, r };
}

/** The summary kept with the rehearsal: counts, flips, capability before and after, shipped units. */
async function summarise(
  sequelize: Sequelize,
  rule: ToleranceRule,
  s: Scope,
  period: Period,
  judged: Judged,
): Promise<RehearsalSummary> {
  const { parts, current, sigmaWithin, draft, r } = judged;
  const byItem = new Map(parts.map((p) => [String(p.itemId), p]));
  const failing = r.parts.filter((f) => f.flip === 'pass-to-fail').map((f) => Number(f.partId));
  const shipped = await shippedUnitsHolding(sequelize, failing);
  const flips = r.parts
    .map((f) => {
      const p = byItem.get(f.partId)!;
      return {
        serial: p.serial,
        itemId: p.itemId,
        at: new Date(p.at).toISOString(),
        flip: f.flip,
        failingPositions: f.failingPositions,
      };
    })
    .sort((a, b) => a.at.localeCompare(b.at));
  const currentLimits = current ? limitsOf(toRuleInForce(current)) : null;
  const draftLimits = limitsOf(draft);
  return {
    period: { from: period.from.toISOString(), to: period.to.toISOString() },
    station: s.station?.code ?? null,
    gauge: s.gauge?.code ?? null,
    current: current && currentLimits ? { version: current.version, ...currentLimits } : null,
    draft: { version: rule.version, ...draftLimits, resolution: draft.resolution ?? null },
    counts: {
      parts: r.counts.parts,
      readings: r.counts.readings,
      skipped: r.counts.skipped,
      partsPassToFail: r.counts.partsPassToFail,
      partsFailToPass: r.counts.partsFailToPass,
      partsFailingBefore: r.counts.partsFailingBefore,
      partsFailingAfter: r.counts.partsFailingAfter,
      readingsPassToFail: r.counts.readingsPassToFail,
      readingsFailToPass: r.counts.readingsFailToPass,
      shippedUnits: new Set(shipped.map((u) => u.unit)).size,
    },
    before: indices(r.capability.before),
    after: indices(r.capability.after),
    sigmaWithin: r.capability.sigmaWithin,
    sigmaSource: sigmaWithin ? 'frozen limits' : r.capability.sigmaWithin ? 'readings' : null,
    parts: flips.slice(0, REHEARSAL_LIST_LIMIT),
    shipped: shipped.slice(0, REHEARSAL_LIST_LIMIT).map((u) => ({
      unit: u.unit,
      part: u.part,
      shipDate: u.ship_date,
      reference: u.reference,
      customer: u.customer,
    })),
    truncated: flips.length > REHEARSAL_LIST_LIMIT || shipped.length > REHEARSAL_LIST_LIMIT,
  };
}

/** The record: the draft is locked and must still be a draft with the limits just rehearsed. */
async function storeRehearsal(
  sequelize: Sequelize,
  ctx: Ctx,
  x: { rule: ToleranceRule; s: Scope; period: Period; summary: RehearsalSummary },
) {
  const { rule, s, period, summary } = x;
  return sequelize.transaction(async (transaction) => {
    const locked = await ToleranceRule.findByPk(rule.id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!locked || locked.status !== 'draft' || !sameLimits(limitsSnapshot(locked), limitsSnapshot(rule))) {
      throw conflict('The draft changed while it was being rehearsed: rehearse it again.', {
        reason: 'rehearsal_stale',
      });
    }
    const created = await RuleRehearsal.create(
      {
        toleranceRuleId: rule.id,
        ruleLimits: limitsSnapshot(rule),
        periodFrom: period.from,
        periodTo: period.to,
        stationId: s.station?.id ?? null,
        gaugeId: s.gauge?.id ?? null,
        summary,
        runById: ctx.actor!.id,
        keptWithApprovalAt: null,
      },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'spec.rule_rehearsed',
      entity: 'tolerance_rule',
      entityId: rule.id,
      after: {
        rehearsal: created.id,
        family: s.family.code,
        characteristic: s.characteristic.code,
        version: rule.version,
        period: summary.period,
        station: summary.station,
        gauge: summary.gauge,
        counts: summary.counts,
        cpkBefore: summary.before?.cpk ?? null,
        cpkAfter: summary.after?.cpk ?? null,
      },
    });
    return created;
  });
}

/** A rule's rehearsals, newest first; `stale` when the draft has changed since. */
export async function listRehearsals(ruleId: number): Promise<RehearsalJson[]> {
  const rule = await ToleranceRule.findByPk(ruleId);
  if (!rule) throw notFound('That rule');
  const rows = await RuleRehearsal.findAll({ where: { toleranceRuleId: ruleId }, order: [['id', 'DESC']], limit: 50 });
  const names = await namesById(rows.map((r) => r.runById));
  return rows.map((r) => present(r, rule, names.get(r.runById) ?? ''));
}
