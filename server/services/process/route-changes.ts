import { Op, type Sequelize, type Transaction } from 'sequelize';
import type { ApproveChangeBody, RouteDraftBody } from '../../../shared/schemas/process.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { conflict, forbidden, invalid, notFound } from '../../errors.js';
import { EngineFamily, Route, RouteStage, Stage } from '../../models/index.js';
import { signWithPassword } from '../signatures.js';
import { partKindInUse } from './part-kinds.js';
import { familyByCode, readRouteVersion } from './route-versions.js';

/**
 * Routes under change control. A change is a new version drafted by one person and approved with
 * another's signature, in force from a time; the version before is superseded from then, kept, and
 * still serves the parts that started on it (`items.route_id`) unless quality moves one explicitly.
 */

export async function draftRoute(sequelize: Sequelize, ctx: Ctx, body: RouteDraftBody) {
  return sequelize.transaction(async (transaction) => {
    const family = await familyByCode(body.family, transaction);
    await partKindInUse(body.partKind, transaction);
    // one drafting at a time per family × part kind, so two drafts cannot take the same version
    await sequelize.query("SELECT pg_advisory_xact_lock(hashtext('route'), :f)", {
      replacements: { f: family.id },
      transaction,
    });
    const existing = await Route.findOne({
      where: { engineFamilyId: family.id, partKind: body.partKind, status: 'draft' },
      transaction,
    });
    if (existing) {
      throw conflict(`Version ${existing.version} of this route is already a draft: approve or discard it first.`, {
        draftId: existing.id,
      });
    }
    const codes = [...new Set(body.steps.flatMap((s) => [s.stage, ...(s.reworkTo ? [s.reworkTo] : [])]))];
    const stages = new Map((await Stage.findAll({ where: { code: codes }, transaction })).map((s) => [s.code, s]));
    const problems: Record<string, string> = {};
    body.steps.forEach((s, i) => {
      const stage = stages.get(s.stage);
      if (!stage) problems[`steps.${i}.stage`] = `There is no stage ${s.stage}.`;
      else if (stage.retiredAt) problems[`steps.${i}.stage`] = `Stage ${s.stage} is retired.`;
      else if (stage.partKind !== body.partKind) {
        problems[`steps.${i}.stage`] = `Stage ${s.stage} is for ${stage.partKind}, not ${body.partKind}.`;
      }
    });
    if (Object.keys(problems).length) throw invalid('Some stages cannot be on this route.', problems);
    const last = (await Route.max('version', {
      where: { engineFamilyId: family.id, partKind: body.partKind },
      transaction,
    })) as number | null;
    const route = await Route.create(
      {
        engineFamilyId: family.id,
        partKind: body.partKind as Route['partKind'],
        version: (last ?? 0) + 1,
        active: false,
        status: 'draft',
        note: body.note,
        createdById: ctx.actor!.id,
      },
      { transaction },
    );
    await RouteStage.bulkCreate(
      body.steps.map((s, i) => ({
        routeId: route.id,
        stageId: stages.get(s.stage)!.id,
        position: i + 1,
        required: s.required,
        reworkToStageId: s.reworkTo ? stages.get(s.reworkTo)!.id : null,
      })),
      { transaction },
    );
    const json = await readRouteVersion(route.id, transaction);
    await recordAudit(ctx, transaction, { action: 'route.drafted', entity: 'route', entityId: route.id, after: json });
    return json;
  });
}

async function lockedDraft(id: number, transaction: Transaction) {
  const route = await Route.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!route) throw notFound('That route version');
  if (route.status !== 'draft') {
    throw conflict(`Version ${route.version} is ${route.status}, not a draft: an approved route is never edited.`);
  }
  return route;
}

export async function discardRoute(sequelize: Sequelize, ctx: Ctx, id: number) {
  return sequelize.transaction(async (transaction) => {
    const route = await lockedDraft(id, transaction);
    await route.update({ status: 'discarded' }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'route.discarded',
      entity: 'route',
      entityId: route.id,
      before: { status: 'draft' },
      after: { status: 'discarded' },
    });
    return readRouteVersion(route.id, transaction);
  });
}

/** Approves a draft with the approver's signature; the version in force is superseded from then. */
export async function approveRoute(sequelize: Sequelize, ctx: Ctx, id: number, input: ApproveChangeBody) {
  return sequelize.transaction(async (transaction) => {
    const route = await lockedDraft(id, transaction);
    if (route.createdById === ctx.actor!.id) {
      throw forbidden('You drafted this version: someone else must approve it.');
    }
    const now = new Date();
    const requested = input.effectiveFrom ? new Date(input.effectiveFrom) : now;
    if (requested.getTime() < now.getTime() - 60_000) {
      throw invalid('A route cannot take effect in the past: parts already on it keep their version.', {
        effectiveFrom: 'Choose now or a later time.',
      });
    }
    const effective = requested < now ? now : requested;
    const others = await Route.findAll({
      where: {
        engineFamilyId: route.engineFamilyId,
        partKind: route.partKind,
        status: 'approved',
        id: { [Op.ne]: id },
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
    const family = (await EngineFamily.findByPk(route.engineFamilyId, { transaction }))!;
    const meaning = `Approved the ${family.code} ${route.partKind} route, version ${route.version}`;
    const { user } = await signWithPassword(ctx, transaction, {
      entity: 'route',
      entityId: String(route.id),
      meaning,
      reason: input.reason,
      password: input.password,
      refused: 'the route was not approved.',
    });
    const takesEffectNow = effective.getTime() <= now.getTime();
    for (const old of others) {
      const before = { status: old.status, supersededAt: old.supersededAt, active: old.active };
      // a version waiting for its time stays in force until then (the station reads the times)
      await old.update(
        takesEffectNow ? { status: 'superseded', supersededAt: effective, active: false } : { supersededAt: effective },
        { transaction },
      );
      await recordAudit(ctx, transaction, {
        action: 'route.superseded',
        entity: 'route',
        entityId: old.id,
        before,
        after: { status: old.status, supersededAt: effective, byVersion: route.version },
      });
    }
    await route.update(
      {
        status: 'approved',
        active: takesEffectNow,
        effectiveFrom: effective,
        approvedById: user.id,
        approvedAt: now,
        approvalReason: input.reason,
      },
      { transaction },
    );
    const json = await readRouteVersion(route.id, transaction);
    await recordAudit(ctx, transaction, {
      action: 'route.approved',
      entity: 'route',
      entityId: route.id,
      before: { status: 'draft' },
      after: {
        ...json,
        signature: { printedName: user.name, meaning, reason: input.reason, signedAt: now.toISOString() },
      },
    });
    return json;
  });
}

/** No new part starts on a retired route; parts already on it finish on it. */
export async function retireRoute(sequelize: Sequelize, ctx: Ctx, id: number, reason: string) {
  return sequelize.transaction(async (transaction) => {
    const route = await Route.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!route) throw notFound('That route version');
    if (route.status !== 'approved' && route.status !== 'superseded') {
      throw conflict(`Version ${route.version} is ${route.status}: only an approved version is retired.`);
    }
    const before = { status: route.status, active: route.active };
    await route.update({ status: 'retired', active: false }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'route.retired',
      entity: 'route',
      entityId: route.id,
      before,
      after: { status: 'retired', active: false, reason },
    });
    return readRouteVersion(route.id, transaction);
  });
}
