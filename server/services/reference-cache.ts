import { QueryTypes, type Attributes, type Sequelize, type Transaction } from 'sequelize';
import type { PartKind } from '../../shared/schemas/reference.js';
import {
  Characteristic,
  EngineFamily,
  Gauge,
  PlantSettings,
  Route,
  RouteStage,
  Stage,
  Station,
  ToleranceRule,
} from '../models/index.js';
import { groupBy } from './group-by.js';

/**
 * The plant's reference data in memory: engine families, stages, routes with their steps, stations,
 * characteristics, the approved and superseded tolerance rules, gauges. A station result needs
 * most of it and it changes a few times a week, so each process keeps a copy and asks only for
 * `reference_version` (bumped by a trigger on every change to those tables) before using it; a
 * moved number means reread everything. The rule in force and a gauge's calibration state are still
 * worked out at the moment of use, from the rules' effective times and today's date.
 *
 * Objects handed out are shared between requests: read them, never change them.
 */
export type RouteWithSteps = {
  route: Route;
  steps: (Attributes<RouteStage> & { stage: Stage })[];
};

export type Reference = {
  version: number;
  family: (id: number) => EngineFamily | undefined;
  families: EngineFamily[];
  stage: (id: number) => Stage | undefined;
  station: (code: string) => Station | undefined;
  stationById: (id: number) => Station | undefined;
  /** The version in force at `at` (default now) for a family and part kind; new parts start on it. */
  route: (familyId: number, kind: PartKind | string, at?: Date) => RouteWithSteps | null;
  /** Any approved version, in force or not: a part keeps the version it started on. */
  routeById: (id: number) => RouteWithSteps | null;
  /** The part's own version where it has one, else the one in force. */
  routeOfItem: (item: { routeId: number | null; engineFamilyId: number; kind: string }) => RouteWithSteps | null;
  /** The stage's characteristics in use (not retired). */
  characteristics: (stageId: number) => Characteristic[];
  characteristic: (id: number) => Characteristic | undefined;
  rules: (familyId: number, characteristicId: number) => ToleranceRule[];
  rule: (id: number) => ToleranceRule | undefined;
  gauges: Gauge[];
  gauge: (id: number) => Gauge | undefined;
  /** The plant's time zone: a gauge's due date and "today" are the plant's calendar, not UTC. */
  timeZone: string;
};

// one copy per database connection pool (tests run several in one process)
const cache = new WeakMap<Sequelize, Reference>();

export type VersionRead = { version: number; mine: boolean };

/**
 * The version as the database has it now (inside `transaction` where one is open). `mine`: this
 * very transaction changed reference data and has not committed; what it sees must not be kept.
 */
export const VERSION_SQL = `SELECT version, xmin::text = (txid_current_if_assigned() % 4294967296)::text AS mine
  FROM reference_version`;

/** A row of VERSION_SQL (the version comes as text: it is a bigint). */
export type VersionRow = { version: string; mine: boolean | null };
export const versionRead = (row: VersionRow | undefined): VersionRead => ({
  version: Number(row?.version ?? 0),
  mine: !!row?.mine,
});

export async function referenceVersion(sequelize: Sequelize, transaction?: Transaction): Promise<VersionRead> {
  const [row] = await sequelize.query<VersionRow>(VERSION_SQL, { type: QueryTypes.SELECT, transaction });
  return versionRead(row);
}

/**
 * The reference data at `version` (read now when not given). Reading it again goes through the
 * caller's transaction, so a request never waits for a second pool connection.
 */
export async function referenceData(
  sequelize: Sequelize,
  transaction?: Transaction,
  known?: VersionRead,
): Promise<Reference> {
  const { version: v, mine } = known ?? (await referenceVersion(sequelize, transaction));
  const cached = cache.get(sequelize);
  if (cached && cached.version === v && !mine) return cached;
  const t = { transaction };
  const families = await EngineFamily.findAll({ order: [['id', 'ASC']], ...t });
  const stages = await Stage.findAll(t);
  const stations = await Station.findAll(t);
  const routes = await Route.findAll({
    where: { status: ['approved', 'superseded', 'retired'] },
    order: [['version', 'DESC']],
    ...t,
  });
  const steps = await RouteStage.findAll({ order: [['position', 'ASC']], ...t });
  const characteristics = await Characteristic.findAll({
    order: [
      ['sortOrder', 'ASC'],
      ['id', 'ASC'],
    ],
    ...t,
  });
  const rules = await ToleranceRule.findAll({ where: { status: ['approved', 'superseded'] }, ...t });
  const gauges = await Gauge.findAll({ order: [['code', 'ASC']], ...t });
  const plant = await PlantSettings.findByPk(1, { attributes: ['timeZone'], ...t });

  const stageById = new Map(stages.map((s) => [s.id, s]));
  const stepsOf = groupBy(steps, (s) => s.routeId);
  const routeById = new Map<number, RouteWithSteps>();
  for (const r of routes) {
    routeById.set(r.id, {
      route: r,
      steps: (stepsOf.get(r.id) ?? []).map((s) => ({ ...s.get(), stage: stageById.get(s.stageId)! })),
    });
  }
  // newest version first, so the first one in force at a time is the one
  const versionsOf = groupBy([...routeById.values()], (r) => `${r.route.engineFamilyId}:${r.route.partKind}`);
  const inForce = (familyId: number, kind: string, at = new Date()) =>
    (versionsOf.get(`${familyId}:${kind}`) ?? []).find(
      ({ route: r }) =>
        r.status !== 'retired' &&
        (r.effectiveFrom === null || r.effectiveFrom <= at) &&
        (r.supersededAt === null || r.supersededAt > at),
    ) ?? null;
  const charsOf = groupBy(
    characteristics.filter((c) => !c.retiredAt),
    (c) => c.stageId,
  );
  const rulesOf = groupBy(rules, (r) => `${r.engineFamilyId}:${r.characteristicId}`);
  const familyById = new Map(families.map((f) => [f.id, f]));
  const stationByCode = new Map(stations.map((s) => [s.code, s]));
  const stationById = new Map(stations.map((s) => [s.id, s]));
  const charById = new Map(characteristics.map((c) => [c.id, c]));
  const gaugeById = new Map(gauges.map((g) => [g.id, g]));
  const ruleById = new Map(rules.map((r) => [r.id, r]));
  const reference: Reference = {
    version: v,
    family: (id) => familyById.get(id),
    families,
    stage: (id) => stageById.get(id),
    station: (code) => stationByCode.get(code),
    stationById: (id) => stationById.get(id),
    route: inForce,
    routeById: (id) => routeById.get(id) ?? null,
    routeOfItem: (item) =>
      (item.routeId !== null ? routeById.get(item.routeId) : undefined) ?? inForce(item.engineFamilyId, item.kind),
    characteristics: (stageId) => charsOf.get(stageId) ?? [],
    characteristic: (id) => charById.get(id),
    rules: (familyId, characteristicId) => rulesOf.get(`${familyId}:${characteristicId}`) ?? [],
    rule: (id) => ruleById.get(id),
    gauges,
    gauge: (id) => gaugeById.get(id),
    timeZone: plant?.timeZone ?? 'UTC',
  };
  if (!mine) cache.set(sequelize, reference);
  return reference;
}
