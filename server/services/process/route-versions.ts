import { QueryTypes, type Transaction } from 'sequelize';
import type { RouteVersionJson } from '../../../shared/schemas/process.js';
import { invalid, notFound } from '../../errors.js';
import { EngineFamily, Item, Route, RouteStage, Stage, User } from '../../models/index.js';
import { settleRouteVersions } from './route-clock.js';

/** Reading route versions: a family's versions, one version, and two compared. */

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

export async function familyByCode(code: string, transaction?: Transaction) {
  const family = await EngineFamily.findOne({ where: { code }, transaction });
  if (!family) throw notFound(`Engine family ${code}`);
  return family;
}

/** Every version of a family's routes (of one part kind), newest first. */
export async function listRouteVersions(familyCode: string, partKind?: string) {
  await settleRouteVersions(Route.sequelize!);
  const family = await familyByCode(familyCode);
  const { loaded, stages } = await load({ engineFamilyId: family.id, ...(partKind ? { partKind } : {}) });
  return present(loaded, stages);
}

export async function readRouteVersion(id: number, transaction?: Transaction) {
  const { loaded, stages } = await load({ id }, transaction);
  if (!loaded[0]) throw notFound('That route version');
  return (await present(loaded, stages, transaction))[0]!;
}

export async function routeVersion(id: number) {
  await settleRouteVersions(Route.sequelize!);
  return readRouteVersion(id);
}

/** Two versions side by side, with each stage marked added, removed, moved or changed. */
export async function compareRoutes(a: number, b: number) {
  const [left, right] = [await readRouteVersion(a), await readRouteVersion(b)];
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
