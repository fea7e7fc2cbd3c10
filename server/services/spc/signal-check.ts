import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { RUN_RULE_TEXT, type RunRule } from '../../../shared/domain/spc/index.js';
import { CHART_KIND_LABELS, type StoredSignalJson } from '../../../shared/schemas/spc.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { appLink } from '../../mail/links.js';
import { enqueueMail } from '../../mail/messages.js';
import {
  SpcSignal,
  User,
  type Item,
  type Nonconformance,
  type SpcLimits,
  type Stage,
  type Station,
} from '../../models/index.js';
import type { Reference } from '../reference-cache.js';
import { limitsFor, limitsInForce } from './limits.js';
import type { PartReadings } from './readings.js';
import { buildSeries, computeChart, limitsFit } from './series.js';
import { holdForSignal } from './signal-hold.js';

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
type Input = { ref: Reference; item: Item; stage: Stage; station: Station; resultId: number };

export async function checkControlLimits(
  sequelize: Sequelize,
  ctx: Ctx,
  transaction: Transaction,
  input: Input,
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
    const found = await signalsOnNewPoint(sequelize, transaction, limits, input.resultId);
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
    await recordSignals(ctx, transaction, input, { code: c.code, limits, found, ncr });
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

/** The run rules the new result's point breaks on each chart of these limits (none if it has no complete point). */
async function signalsOnNewPoint(
  sequelize: Sequelize,
  transaction: Transaction,
  limits: SpcLimits,
  resultId: number,
): Promise<Found[]> {
  const n = 'n' in limits.limits ? limits.limits.n : 1;
  const series = buildSeries(await recentParts(sequelize, transaction, limits, n), 'auto');
  if (series.points.at(-1)?.resultId !== resultId || !limitsFit(limits.limits, { ...series, method: limits.method })) {
    return []; // the new result has no complete point for these limits (a position left out)
  }
  const computed = computeChart({ ...series, method: limits.method }, { limits: limits.limits });
  const last = series.points.length - 1;
  return computed.charts.flatMap((chart) => {
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
}

/** The signal rows (with the hold, if one was made) and their audit event. */
async function recordSignals(
  ctx: Ctx,
  transaction: Transaction,
  input: Input,
  signal: { code: string; limits: SpcLimits; found: Found[]; ncr: Nonconformance | null },
) {
  const { limits, found, ncr } = signal;
  const at = new Date();
  await SpcSignal.bulkCreate(
    found.map((f) => ({
      spcLimitsId: limits.id,
      stageResultId: input.resultId,
      itemId: input.item.id,
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
      item: input.item.serial,
      characteristic: signal.code,
      limits: limits.id,
      signals: found.map((f) => ({ chart: f.chart, rule: f.rule, value: f.value })),
      heldBy: ncr?.number ?? null,
    },
  });
}
