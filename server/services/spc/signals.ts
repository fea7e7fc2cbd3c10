import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { RUN_RULE_TEXT, type RunRule } from '../../../shared/domain/spc/index.js';
import { CHART_KIND_LABELS, periodBounds, type StoredSignalJson } from '../../../shared/schemas/spc.js';
import { mayMove } from '../../../shared/domain/item-lifecycle.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { moveItem } from '../item-moves.js';
import { conflict, notFound } from '../../errors.js';
import { appLink } from '../../mail/links.js';
import { enqueueMail } from '../../mail/messages.js';
import { Item, Nonconformance, SpcSignal, User, type SpcLimits, type Stage, type Station } from '../../models/index.js';
import { raiseNonconformance } from '../ncrs/index.js';
import type { Reference } from '../reference-cache.js';
import { lockUnitsReachedBy } from '../unit-locks.js';
import { limitsFor, limitsInForce } from './limits.js';
import type { PartReadings } from './readings.js';
import { resolveScope } from './scope.js';
import { buildSeries, computeChart, limitsFit } from './series.js';

/**
 * Run-rule signals against frozen limits, found when a station result is stored: the new point is
 * judged with the points before it, in the result's own transaction, so the signal, its e-mail to
 * quality and any hold exist exactly when the result does.
 */

/** Points the run rules look back over: rule 4 needs eight in a row. */
const WINDOW = 8;

/** The last points of a characteristic for a family (and station), newest first, read backwards along
 * `readings_characteristic_idx`: (WINDOW + 1) × n rows at most. */
const RECENT_SQL = (station: boolean) => `SELECT r.stage_result_id AS id, i.serial,
       (extract(epoch FROM r.created_at) * 1000)::bigint AS at, sr.station_id, r.gauge_id, r.value
  FROM readings r
  JOIN stage_results sr ON sr.id = r.stage_result_id
  JOIN items i ON i.id = sr.item_id
 WHERE r.characteristic_id = :characteristicId AND r.value IS NOT NULL AND i.engine_family_id = :familyId
   ${station ? 'AND sr.station_id = :stationId' : ''}
   AND NOT EXISTS (SELECT 1 FROM stage_results x WHERE x.supersedes_id = sr.id)
 ORDER BY r.created_at DESC, r.stage_result_id DESC
 LIMIT :rows`;

type RecentRow = {
  id: number;
  serial: string;
  at: string;
  station_id: number | null;
  gauge_id: number | null;
  value: number;
};

async function recentParts(
  sequelize: Sequelize,
  transaction: Transaction,
  limits: SpcLimits,
  n: number,
): Promise<PartReadings[]> {
  const rows = await sequelize.query<RecentRow>(RECENT_SQL(limits.stationId !== null), {
    type: QueryTypes.SELECT,
    transaction,
    replacements: {
      characteristicId: limits.characteristicId,
      familyId: limits.engineFamilyId,
      stationId: limits.stationId,
      rows: (WINDOW + 1) * n,
    },
  });
  const parts = new Map<number, PartReadings>();
  for (const r of rows) {
    const p = parts.get(r.id);
    if (p) p.values.push(r.value);
    else
      parts.set(r.id, {
        resultId: r.id,
        serial: r.serial,
        at: Number(r.at),
        stationId: r.station_id,
        gaugeId: r.gauge_id,
        values: [r.value],
      });
  }
  return [...parts.values()].reverse();
}

type Found = {
  limits: SpcLimits;
  chart: StoredSignalJson['chart'];
  rule: RunRule;
  value: number;
  centre: number;
  lower: number;
  upper: number;
};

async function qualityMail(
  transaction: Transaction,
  input: {
    serial: string;
    family: string;
    name: string;
    unit: string | null;
    station: string;
    found: Found[];
    held: string | null;
  },
) {
  const people = await User.findAll({ where: { role: 'quality', active: true }, attributes: ['email'], transaction });
  const unit = input.unit ? ` ${input.unit}` : '';
  const lines = input.found.map(
    (f) =>
      `- ${CHART_KIND_LABELS[f.chart]}: ${f.value.toPrecision(7)}${unit} — ${RUN_RULE_TEXT[f.rule]} (rule ${f.rule}; limits ${f.lower.toPrecision(7)} to ${f.upper.toPrecision(7)}, centre ${f.centre.toPrecision(7)})`,
  );
  const first = input.found[0]!.limits;
  const text = [
    `A result for ${input.serial} (${input.family}) at ${input.station} broke a run rule on the control chart of ${input.name}:`,
    '',
    ...lines,
    '',
    input.held
      ? `The part is on hold under ${input.held} until quality decides.`
      : 'The part was not put on hold. Look at the chart and decide whether to hold it.',
    `Open the chart: ${appLink(`/spc?family=${encodeURIComponent(input.family)}&characteristic=${first.characteristicId}`)}`,
    '',
    '— Coretrail',
  ].join('\n');
  await enqueueMail(
    transaction,
    people.map((p) => ({
      to: p.email,
      subject: `Control chart signal: ${input.name} on ${input.serial}`,
      text,
      reason: 'spc.signal',
    })),
  );
}

/**
 * Puts a part on hold for a signal, through the NCR path. The caller has already locked the units
 * the part reaches and then the part's row (the lock protocol, server/services/unit-locks.ts).
 */
async function holdForSignal(
  sequelize: Sequelize,
  ctx: Ctx,
  transaction: Transaction,
  item: Item,
  description: string,
  origin: string,
): Promise<Nonconformance> {
  const ncr = await raiseNonconformance(sequelize, ctx, transaction, {
    itemId: item.id,
    itemSerial: item.serial,
    itemStatusBefore: item.status,
    stageId: item.currentStageId,
    stageResultId: null,
    severity: 'minor',
    defectCode: null,
    description,
    failing: [],
    origin,
  });
  // a shipped unit is not held in the plant (as for a concern): the NCR stands, containment is in the field
  if (item.status !== 'on_hold' && mayMove(item.status, 'on_hold')) {
    await moveItem(ctx, transaction, item, { status: 'on_hold' }, 'item.held', { byNcr: ncr.number });
  }
  return ncr;
}

function describe(serial: string, name: string, unit: string | null, found: Found[]) {
  const u = unit ? ` ${unit}` : '';
  const what = found
    .map((f) => `${CHART_KIND_LABELS[f.chart].toLowerCase()} ${f.value.toPrecision(7)}${u}: ${RUN_RULE_TEXT[f.rule]}`)
    .join('; ');
  return `Control chart signal on ${serial}, ${name}: ${what}. In tolerance, but the process may have moved; held for review.`;
}

/**
 * The station's one call into SPC, inside `submitResult`'s transaction after the readings are
 * stored and the part has moved on. Asks the database nothing unless frozen limits cover one of the
 * stage's characteristics for this family and station (the limits in force live beside the
 * reference data in memory); then one read of the last points per such characteristic. On a
 * signal: the signal rows, an e-mail to quality and, when the limits say so, a hold (an NCR).
 * The caller holds the units the part reaches and the part's row, as submitResult takes them.
 */
export async function checkControlLimits(
  sequelize: Sequelize,
  ctx: Ctx,
  transaction: Transaction,
  input: { ref: Reference; item: Item; stage: Stage; station: Station; resultId: number },
): Promise<{ signals: number; heldBy: string | null }> {
  const { ref, item, stage, station } = input;
  const map = await limitsInForce(sequelize, ref, transaction);
  if (!map.size) return { signals: 0, heldBy: null };
  const covered = ref
    .characteristics(stage.id)
    .filter((c) => c.kind !== 'attribute')
    .map((c) => ({ c, limits: limitsFor(map, item.engineFamilyId, c.id, station.id) }))
    .filter((x): x is { c: (typeof x)['c']; limits: SpcLimits } => x.limits !== null);
  if (!covered.length) return { signals: 0, heldBy: null };

  let heldBy: string | null = null;
  let total = 0;
  for (const { c, limits } of covered) {
    const n = 'n' in limits.limits ? limits.limits.n : 1;
    const series = buildSeries(await recentParts(sequelize, transaction, limits, n), 'auto');
    if (
      series.points.at(-1)?.resultId !== input.resultId ||
      !limitsFit(limits.limits, { ...series, method: limits.method })
    ) {
      continue; // the new result has no complete point for these limits (a position left out)
    }
    const computed = computeChart({ ...series, method: limits.method }, { limits: limits.limits });
    const last = series.points.length - 1;
    const found: Found[] = computed.charts.flatMap((chart) => {
      const point = chart.points.find((p) => p.index === last);
      return (point?.flags ?? []).map((rule) => ({
        limits,
        chart: chart.kind,
        rule,
        value: point!.value,
        centre: chart.centre,
        lower: chart.lower,
        upper: chart.upper,
      }));
    });
    if (!found.length) continue;
    total += found.length;
    let ncr: Nonconformance | null = null;
    if (limits.holdOnSignal && !['on_hold', 'scrapped'].includes(item.status)) {
      ncr = await holdForSignal(
        sequelize,
        ctx,
        transaction,
        item,
        describe(item.serial, c.name, c.unit, found),
        `Raised by a control chart signal at ${station.name}`,
      );
      heldBy = ncr.number;
    }
    const at = new Date();
    await SpcSignal.bulkCreate(
      found.map((f) => ({
        spcLimitsId: limits.id,
        stageResultId: input.resultId,
        itemId: item.id,
        chart: f.chart,
        rule: f.rule,
        value: f.value,
        centre: f.centre,
        lowerLimit: f.lower,
        upperLimit: f.upper,
        nonconformanceId: ncr?.id ?? null,
        heldById: ncr ? ctx.actor!.id : null,
        heldAt: ncr ? at : null,
      })),
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'spc.signal_raised',
      entity: 'stage_result',
      entityId: input.resultId,
      after: {
        item: item.serial,
        characteristic: c.code,
        limits: limits.id,
        signals: found.map((f) => ({ chart: f.chart, rule: f.rule, value: f.value })),
        heldBy: ncr?.number ?? null,
      },
    });
    await qualityMail(transaction, {
      serial: item.serial,
      family: ref.family(item.engineFamilyId)?.code ?? '',
      name: c.name,
      unit: c.unit,
      station: station.name,
      found,
      held: ncr?.number ?? null,
    });
  }
  return { signals: total, heldBy };
}

// ——— reading and acting on stored signals ———

type SignalRow = {
  id: number;
  serial: string;
  result_id: number;
  at: Date;
  station: string | null;
  chart: StoredSignalJson['chart'];
  rule: RunRule;
  value: number;
  centre: number;
  lower_limit: number;
  upper_limit: number;
  limits_id: number;
  ncr: string | null;
  held_by: string | null;
  held_at: Date | null;
};

const SIGNALS_SQL = `SELECT g.id, i.serial, g.stage_result_id AS result_id, g.created_at AS at, st.code AS station, g.chart,
       g.rule, g.value, g.centre, g.lower_limit, g.upper_limit, g.spc_limits_id AS limits_id, n.number AS ncr,
       u.name AS held_by, g.held_at
  FROM spc_signals g
  JOIN spc_limits l ON l.id = g.spc_limits_id
  JOIN items i ON i.id = g.item_id
  JOIN stage_results sr ON sr.id = g.stage_result_id
  LEFT JOIN stations st ON st.id = sr.station_id
  LEFT JOIN nonconformances n ON n.id = g.nonconformance_id
  LEFT JOIN users u ON u.id = g.held_by_id`;

const presentSignal = (r: SignalRow): StoredSignalJson => ({
  id: r.id,
  serial: r.serial,
  resultId: r.result_id,
  at: new Date(r.at).toISOString(),
  station: r.station,
  chart: r.chart,
  chartLabel: CHART_KIND_LABELS[r.chart],
  rule: r.rule,
  text: RUN_RULE_TEXT[r.rule],
  value: r.value,
  centre: r.centre,
  lower: r.lower_limit,
  upper: r.upper_limit,
  limitsId: r.limits_id,
  ncr: r.ncr,
  heldBy: r.held_by,
  heldAt: r.held_at ? new Date(r.held_at).toISOString() : null,
});

/** Signals raised at stations for a family × characteristic, newest first (at most 500). */
export async function listSignals(
  sequelize: Sequelize,
  q: { family: string; characteristicId: number; from?: string; to?: string },
): Promise<StoredSignalJson[]> {
  const s = await resolveScope(sequelize, q);
  const period = q.from && q.to ? periodBounds(q.from, q.to) : null;
  const rows = await sequelize.query<SignalRow>(
    `${SIGNALS_SQL}
     WHERE l.engine_family_id = :familyId AND l.characteristic_id = :characteristicId
       ${period ? 'AND g.created_at >= :from AND g.created_at < :to' : ''}
     ORDER BY g.id DESC LIMIT 500`,
    {
      type: QueryTypes.SELECT,
      replacements: {
        familyId: s.family.id,
        characteristicId: s.characteristic.id,
        from: period?.from.toISOString(),
        to: period?.to.toISOString(),
      },
    },
  );
  return rows.map(presentSignal);
}

/** Quality or a supervisor puts a signal's part on hold after looking at the chart: an NCR, as a concern is. */
export async function holdSignalPart(
  sequelize: Sequelize,
  ctx: Ctx,
  id: number,
  reason: string,
): Promise<StoredSignalJson> {
  await sequelize.transaction(async (transaction) => {
    const signal = await SpcSignal.findByPk(id, { transaction });
    if (!signal) throw notFound('That signal');
    // the lock protocol: the units the part reaches, then the part, then the signal rows
    await lockUnitsReachedBy(sequelize, { itemId: signal.itemId }, transaction);
    const item = (await Item.findByPk(signal.itemId, { transaction, lock: transaction.LOCK.UPDATE }))!;
    const siblings = await SpcSignal.findAll({
      where: { stageResultId: signal.stageResultId, spcLimitsId: signal.spcLimitsId },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    const held = siblings.find((x) => x.nonconformanceId !== null);
    if (held) {
      const ncr = await Nonconformance.findByPk(held.nonconformanceId!, { transaction });
      throw conflict(`${item.serial} is already held for this signal under ${ncr?.number ?? 'an NCR'}.`, {
        ncr: ncr?.number,
      });
    }
    if (item.status === 'scrapped') throw conflict(`${item.serial} has been scrapped: there is nothing left to hold.`);
    const ref = (await resolveScopeForSignal(sequelize, signal, transaction)) ?? null;
    const ncr = await holdForSignal(
      sequelize,
      ctx,
      transaction,
      item,
      `Control chart signal on ${item.serial}${ref ? `, ${ref}` : ''}: ${RUN_RULE_TEXT[signal.rule as RunRule]}. ${reason}`,
      'Raised from a control chart signal',
    );
    const now = new Date();
    for (const s of siblings) {
      await s.update({ nonconformanceId: ncr.id, heldById: ctx.actor!.id, heldAt: now }, { transaction });
    }
    await recordAudit(ctx, transaction, {
      action: 'spc.signal_held',
      entity: 'spc_signal',
      entityId: signal.id,
      before: { nonconformance: null },
      after: { nonconformance: ncr.number, item: item.serial, reason },
    });
  });
  const [row] = await sequelize.query<SignalRow>(`${SIGNALS_SQL} WHERE g.id = :id`, {
    type: QueryTypes.SELECT,
    replacements: { id },
  });
  return presentSignal(row!);
}

async function resolveScopeForSignal(sequelize: Sequelize, signal: SpcSignal, transaction: Transaction) {
  const [row] = await sequelize.query<{ name: string }>(
    'SELECT c.name FROM spc_limits l JOIN characteristics c ON c.id = l.characteristic_id WHERE l.id = :id',
    { type: QueryTypes.SELECT, replacements: { id: signal.spcLimitsId }, transaction },
  );
  return row?.name ?? null;
}
