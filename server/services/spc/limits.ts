import { Op, QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { ChartLimits } from '../../../shared/domain/spc/index.js';
import {
  chartLimitsSchema,
  periodBounds,
  type FreezeLimitsBody,
  type FrozenLimitsJson,
} from '../../../shared/schemas/spc.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { invalid } from '../../errors.js';
import { SpcLimits, User } from '../../models/index.js';
import type { Reference } from '../reference-cache.js';
import { partReadings } from './readings.js';
import { resolveScope } from './scope.js';
import { buildSeries, computeChart, linesOf } from './series.js';

/**
 * Control limits frozen from a baseline period. Freezing recomputes them on the server from the
 * stored readings (nothing the client sends is taken as a limit), supersedes the set in force for
 * the same family × characteristic × station, and writes both audit events in one transaction.
 * A freeze bumps the reference version (a trigger), so every API process rereads the limits in force.
 */

const keyOf = (familyId: number, characteristicId: number, stationId: number | null) =>
  `${familyId}:${characteristicId}:${stationId ?? 0}`;

// the limits in force, read once per reference version (a freeze moves the version)
const inForce = new WeakMap<Reference, Map<string, SpcLimits>>();

export async function limitsInForce(
  sequelize: Sequelize,
  ref: Reference,
  transaction?: Transaction,
): Promise<Map<string, SpcLimits>> {
  const known = inForce.get(ref);
  if (known) return known;
  const rows = await SpcLimits.findAll({ where: { supersededAt: null }, transaction });
  const map = new Map(rows.map((r) => [keyOf(r.engineFamilyId, r.characteristicId, r.stationId), r]));
  inForce.set(ref, map);
  return map;
}

/** The limits that judge a result at a station: the station's own, else those for every station. */
export function limitsFor(
  map: Map<string, SpcLimits>,
  familyId: number,
  characteristicId: number,
  stationId: number | null,
): SpcLimits | null {
  return (
    (stationId ? map.get(keyOf(familyId, characteristicId, stationId)) : undefined) ??
    map.get(keyOf(familyId, characteristicId, null)) ??
    null
  );
}

export function presentLimits(row: SpcLimits, ref: Reference, frozenBy: string): FrozenLimitsJson {
  const lines = linesOf(row.limits);
  return {
    id: row.id,
    family: ref.family(row.engineFamilyId)?.code ?? '',
    characteristicId: row.characteristicId,
    station: row.stationId ? (ref.stationById(row.stationId)?.code ?? null) : null,
    method: row.method,
    limits: row.limits as FrozenLimitsJson['limits'],
    centre: lines.centre,
    lower: lines.lower,
    upper: lines.upper,
    sigmaWithin: lines.sigmaWithin,
    baselineFrom: row.baselineFrom.toISOString(),
    baselineTo: row.baselineTo.toISOString(),
    baselinePoints: row.baselinePoints,
    reason: row.reason,
    holdOnSignal: row.holdOnSignal,
    frozenBy,
    frozenAt: row.frozenAt.toISOString(),
    supersededAt: row.supersededAt?.toISOString() ?? null,
  };
}

export async function namesById(ids: number[], transaction?: Transaction): Promise<Map<number, string>> {
  const wanted = [...new Set(ids)];
  if (!wanted.length) return new Map();
  const users = await User.findAll({ where: { id: { [Op.in]: wanted } }, attributes: ['id', 'name'], transaction });
  return new Map(users.map((u) => [u.id, u.name]));
}

export async function freezeLimits(sequelize: Sequelize, ctx: Ctx, body: FreezeLimitsBody): Promise<FrozenLimitsJson> {
  return sequelize.transaction(async (transaction) => {
    const s = await resolveScope(sequelize, body, transaction);
    const stationId = s.station?.id ?? null;
    // one freeze at a time per family × characteristic × station
    await sequelize.query('SELECT pg_advisory_xact_lock(hashtextextended(:key, 7243))', {
      replacements: { key: keyOf(s.family.id, s.characteristic.id, stationId) },
      transaction,
    });
    const baseline = periodBounds(body.baselineFrom, body.baselineTo);
    const parts = await partReadings(
      sequelize,
      { familyId: s.family.id, characteristicId: s.characteristic.id, ...baseline, stationId },
      transaction,
    );
    const series = buildSeries(parts, body.chart);
    if (series.partsPerPoint !== null) {
      throw invalid(
        'Limits are frozen on charts with one point per part: part means, individuals, or X̄ over positions.',
        {
          chart: 'Choose a chart with one point per part.',
        },
      );
    }
    if (series.subgroups.length < 2) {
      throw invalid(
        `The baseline period holds ${series.subgroups.length} complete part${series.subgroups.length === 1 ? '' : 's'} of ${s.family.code}: limits need at least 2 (20 or more is usual).`,
        { baselineTo: 'Choose a longer baseline.' },
      );
    }
    const limits: ChartLimits = chartLimitsSchema.parse(computeChart(series).limits);
    const previous = await SpcLimits.findOne({
      where: { engineFamilyId: s.family.id, characteristicId: s.characteristic.id, stationId, supersededAt: null },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    const [{ id }] = (await sequelize.query("SELECT nextval('spc_limits_id_seq')::int AS id", {
      type: QueryTypes.SELECT,
      transaction,
    })) as [{ id: number }];
    const now = new Date();
    if (previous) {
      await previous.update({ supersededAt: now, supersededById: id }, { transaction });
      await recordAudit(ctx, transaction, {
        action: 'spc.limits_superseded',
        entity: 'spc_limits',
        entityId: previous.id,
        before: { supersededAt: null },
        after: { supersededAt: now, byLimits: id },
      });
    }
    const row = await SpcLimits.create(
      {
        id,
        engineFamilyId: s.family.id,
        characteristicId: s.characteristic.id,
        stationId,
        method: series.method,
        limits,
        baselineFrom: baseline.from,
        baselineTo: baseline.to,
        baselinePoints: series.subgroups.length,
        reason: body.reason,
        holdOnSignal: body.holdOnSignal,
        frozenById: ctx.actor!.id,
        frozenAt: now,
        supersededAt: null,
        supersededById: null,
      },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'spc.limits_frozen',
      entity: 'spc_limits',
      entityId: row.id,
      after: {
        family: s.family.code,
        characteristic: s.characteristic.code,
        station: s.station?.code ?? null,
        method: row.method,
        limits,
        baselineFrom: baseline.from,
        baselineTo: baseline.to,
        baselinePoints: row.baselinePoints,
        reason: row.reason,
        holdOnSignal: row.holdOnSignal,
        supersedes: previous?.id ?? null,
      },
    });
    const name = ctx.actor!.name ?? (await namesById([ctx.actor!.id], transaction)).get(ctx.actor!.id) ?? '';
    return presentLimits(row, s.ref, name);
  });
}

/** Every set of limits frozen for a family × characteristic, newest first, the ones in force included. */
export async function limitsHistory(
  sequelize: Sequelize,
  q: { family: string; characteristicId: number },
): Promise<FrozenLimitsJson[]> {
  const s = await resolveScope(sequelize, q);
  const rows = await SpcLimits.findAll({
    where: { engineFamilyId: s.family.id, characteristicId: s.characteristic.id },
    order: [['id', 'DESC']],
  });
  const names = await namesById(rows.map((r) => r.frozenById));
  return rows.map((r) => presentLimits(r, s.ref, names.get(r.frozenById) ?? ''));
}
