import { Op, QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { ApproveChangeBody, RouteDraftBody, RouteVersionJson } from '../../shared/schemas/process.js';
import { recordAudit, systemCtx, type Ctx } from '../audit.js';
import { conflict, forbidden, invalid, notFound } from '../errors.js';
import { EngineFamily, Item, Route, RouteStage, Stage, User } from '../models/index.js';
import { findBySerial } from './items.js';
import { partKindInUse } from './process.js';
import { signWithPassword } from './signatures.js';

/**
 * Routes under change control. A change is a new version drafted by one person and approved with
 * another's signature, in force from a time; the version before is superseded from then, kept, and
 * still serves the parts that started on it (`items.route_id`) unless quality moves one explicitly.
 */

type Loaded = { route: Route; steps: (RouteStage & { stage?: Stage })[] };

async function load(where: { id?: number; engineFamilyId?: number; partKind?: string }, transaction?: Transaction) {
  const routes = await Route.findAll({ where, order: [['version', 'DESC']], transaction });
  const steps = routes.length
    ? await RouteStage.findAll({
        where: { routeId: routes.map((r) => r.id) },
        order: [['position', 'ASC']],
        transaction,
      })
    : [];
  const stageIds = [...new Set(steps.flatMap((s) => [s.stageId, s.reworkToStageId ?? s.stageId]))];
  const stages = new Map((await Stage.findAll({ where: { id: stageIds }, transaction })).map((s) => [s.id, s]));
  return {
    loaded: routes.map((route) => ({ route, steps: steps.filter((s) => s.routeId === route.id) })),
    stages,
  };
}

async function present(loaded: Loaded[], stages: Map<number, Stage>, transaction?: Transaction) {
  const userIds = [
    ...new Set(loaded.flatMap(({ route: r }) => [r.createdById, r.approvedById]).filter((x): x is number => !!x)),
  ];
  const names = new Map(
    (await User.findAll({ where: { id: userIds }, attributes: ['id', 'name'], transaction })).map((u) => [
      u.id,
      u.name,
    ]),
  );
  const familyIds = [...new Set(loaded.map((l) => l.route.engineFamilyId))];
  const families = new Map(
    (await EngineFamily.findAll({ where: { id: familyIds }, transaction })).map((f) => [f.id, f.code]),
  );
  const counts = loaded.length
    ? await Item.sequelize!.query<{ route_id: number; n: number }>(
        'SELECT route_id, count(*)::int AS n FROM items WHERE route_id IN (:ids) GROUP BY route_id',
        { replacements: { ids: loaded.map((l) => l.route.id) }, type: QueryTypes.SELECT, transaction },
      )
    : [];
  const partsOn = new Map(counts.map((c) => [c.route_id, c.n]));
  const now = new Date();
  return loaded.map(({ route: r, steps }): RouteVersionJson => ({
    id: r.id,
    family: families.get(r.engineFamilyId) ?? '',
    partKind: r.partKind,
    version: r.version,
    status: r.status,
    inForce:
      r.status !== 'draft' &&
      r.status !== 'discarded' &&
      r.status !== 'retired' &&
      (!r.effectiveFrom || r.effectiveFrom <= now) &&
      (!r.supersededAt || r.supersededAt > now),
    note: r.note,
    createdById: r.createdById ?? null,
    createdBy: r.createdById ? (names.get(r.createdById) ?? null) : null,
    approvedBy: r.approvedById ? (names.get(r.approvedById) ?? null) : null,
    approvedAt: r.approvedAt?.toISOString() ?? null,
    approvalReason: r.approvalReason,
    effectiveFrom: r.effectiveFrom?.toISOString() ?? null,
    supersededAt: r.supersededAt?.toISOString() ?? null,
    parts: partsOn.get(r.id) ?? 0,
    steps: steps.map((s) => ({
      position: s.position,
      stage: stages.get(s.stageId)?.code ?? '',
      stageName: stages.get(s.stageId)?.name ?? '',
      required: s.required,
      reworkTo: s.reworkToStageId ? (stages.get(s.reworkToStageId)?.code ?? null) : null,
    })),
  }));
}

async function familyByCode(code: string, transaction?: Transaction) {
  const family = await EngineFamily.findOne({ where: { code }, transaction });
  if (!family) throw notFound(`Engine family ${code}`);
  return family;
}

const DUE_SQL = `SELECT id, version, status, active, effective_from <= now() AS started, superseded_at <= now() AS ended
  FROM routes
 WHERE status = 'approved'
   AND ((NOT active AND effective_from <= now() AND (superseded_at IS NULL OR superseded_at > now()))
     OR superseded_at <= now())
 ORDER BY id`;

/**
 * Brings the stored state of route versions up to the clock: a version approved to take effect
 * later becomes the one in force (`active`) when its time comes, and the one it replaces is marked
 * superseded. The times decide what a station reads (reference-cache); the line reads and the
 * document export read the flag, so it must follow. Run by each read of the routes and by a job
 * (RouteClock); a run with nothing due writes nothing, so the reference version is not bumped.
 */
export async function settleRouteVersions(sequelize: Sequelize): Promise<number> {
  const due = await sequelize.query<{ id: number }>(DUE_SQL, { type: QueryTypes.SELECT });
  if (!due.length) return 0;
  return sequelize.transaction(async (transaction) => {
    const rows = await sequelize.query<{ id: number; version: number; started: boolean; ended: boolean | null }>(
      `${DUE_SQL} FOR UPDATE`,
      { type: QueryTypes.SELECT, transaction },
    );
    const ctx = systemCtx();
    for (const r of rows) {
      const route = (await Route.findByPk(r.id, { transaction }))!;
      const before = { status: route.status, active: route.active };
      if (r.ended) {
        await route.update({ status: 'superseded', active: false }, { transaction });
        await recordAudit(ctx, transaction, {
          action: 'route.superseded',
          entity: 'route',
          entityId: route.id,
          before,
          after: { status: 'superseded', active: false, supersededAt: route.supersededAt },
        });
      } else {
        await route.update({ active: true }, { transaction });
        await recordAudit(ctx, transaction, {
          action: 'route.took_effect',
          entity: 'route',
          entityId: route.id,
          before,
          after: { status: route.status, active: true, effectiveFrom: route.effectiveFrom },
        });
      }
    }
    return rows.length;
  });
}

/** Every version of a family's routes (of one part kind), newest first. */
export async function listRouteVersions(familyCode: string, partKind?: string) {
  await settleRouteVersions(Route.sequelize!);
  const family = await familyByCode(familyCode);
  const { loaded, stages } = await load({ engineFamilyId: family.id, ...(partKind ? { partKind } : {}) });
  return present(loaded, stages);
}

async function one(id: number, transaction?: Transaction) {
  const { loaded, stages } = await load({ id }, transaction);
  if (!loaded[0]) throw notFound('That route version');
  return (await present(loaded, stages, transaction))[0]!;
}

export async function routeVersion(id: number) {
  await settleRouteVersions(Route.sequelize!);
  return one(id);
}

/** Two versions side by side, with each stage marked added, removed, moved or changed. */
export async function compareRoutes(a: number, b: number) {
  const [left, right] = [await one(a), await one(b)];
  if (left.family !== right.family || left.partKind !== right.partKind) {
    throw invalid('Compare two versions of the same route (family and part kind).');
  }
  const codes = [...new Set([...left.steps, ...right.steps].map((s) => s.stage))];
  const rows = codes.map((code) => {
    const l = left.steps.find((s) => s.stage === code) ?? null;
    const r = right.steps.find((s) => s.stage === code) ?? null;
    const change = !l
      ? 'added'
      : !r
        ? 'removed'
        : l.required !== r.required || l.reworkTo !== r.reworkTo
          ? 'changed'
          : l.position !== r.position
            ? 'moved'
            : 'same';
    return { stage: code, left: l, right: r, change };
  });
  return { left, right, rows };
}

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
    const json = await one(route.id, transaction);
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
    return one(route.id, transaction);
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
    const json = await one(route.id, transaction);
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
    return one(route.id, transaction);
  });
}

/** Quality moves one part to another approved version of its route, with a reason on record. */
export async function moveItemToRoute(
  sequelize: Sequelize,
  ctx: Ctx,
  serial: string,
  body: { routeId: number; reason: string },
) {
  return sequelize.transaction(async (transaction) => {
    const item = await findBySerial(serial, transaction, { lock: true });
    const route = await Route.findByPk(body.routeId, { transaction });
    if (!route || route.engineFamilyId !== item.engineFamilyId || route.partKind !== item.kind) {
      throw invalid(`Choose a version of this part's own route (${item.kind}).`, { routeId: 'Not this route.' });
    }
    if (route.status !== 'approved' && route.status !== 'superseded') {
      throw conflict(`Version ${route.version} is ${route.status}: a part moves only to an approved version.`);
    }
    if (route.id === item.routeId) throw conflict(`${item.serial} is already on version ${route.version}.`);
    const beforeRoute = item.routeId ? await Route.findByPk(item.routeId, { transaction }) : null;
    await item.update({ routeId: route.id }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'item.route_moved',
      entity: 'item',
      entityId: item.serial,
      before: { routeId: beforeRoute?.id ?? null, version: beforeRoute?.version ?? null },
      after: { routeId: route.id, version: route.version, reason: body.reason },
    });
    return { serial: item.serial, routeId: route.id, version: route.version };
  });
}
