import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { conversionFactor } from '../../../shared/domain/units.js';
import type { BlastQuery, TriggerKind } from '../../../shared/schemas/gauges.js';
import { invalid, notFound } from '../../errors.js';
import { Gauge, GaugeCalibration, PartLot, Station, ToleranceRule, User } from '../../models/index.js';
import { plantSettings } from '../plant.js';

/** What went bad, as a scope: which readings (or which lot's units) it touched, and the guard band. */

export type Scope = {
  kind: TriggerKind;
  label: string;
  /** A few words for a signature's meaning: "gauge BG-014", "lot L-12". */
  subject: string;
  /** The SQL condition on readings r joined to stage_results sr, or null for a lot. */
  where: string | null;
  replacements: Record<string, unknown>;
  from: Date | null;
  to: Date | null;
  /** Guard band per reading unit, as JSON for the statement: {"in": 0.0004, "mm": 0.01016}. */
  errors: Record<string, number>;
  guardBand: { error: number; unit: string | null } | null;
  lotId: number | null;
};

const UNITS = ['in', 'mm', 'µin', 'µm', 'lbf·ft', 'N·m', 'psi', 'kPa', 'inHg', '%', 'deg', 'g·in', 'hp', 'min', 'rpm'];

/** Where a gauge's doubt starts: the day of its last good calibration before the bad one (plant's calendar). */
export async function gaugeWindow(gauge: Gauge, transaction?: Transaction) {
  const cals = await GaugeCalibration.findAll({
    where: { gaugeId: gauge.id },
    order: [
      ['calibratedOn', 'DESC'],
      ['id', 'DESC'],
    ],
    transaction,
  });
  const bad = cals.find((c) => !c.asFoundInTolerance) ?? null;
  const after = bad ? cals.slice(cals.indexOf(bad) + 1) : cals;
  const lastGood = after.find((c) => c.asLeftInTolerance) ?? null;
  return { bad, lastGood };
}

/** The trigger as far as it is known: the conditions on readings and what to call it. */
type Trigger = Omit<Scope, 'where' | 'to'> & { conds: string[] };

export async function scopeOf(q: BlastQuery, transaction?: Transaction): Promise<Scope> {
  const tz = (await plantSettings(transaction)).timeZone;
  const t: Trigger = {
    kind: 'window',
    label: 'Every reading',
    subject: 'a time window',
    conds: [],
    replacements: { tz },
    from: q.from ? new Date(q.from) : null,
    errors: {},
    guardBand: null,
    lotId: null,
  };
  const to = q.to ? new Date(q.to) : null;
  if (q.gauge) await gaugeTrigger(t, q, q.gauge, transaction);
  else await otherTrigger(t, q, transaction);
  const { conds, replacements, from } = t;
  if (from) {
    conds.push('r.created_at >= :from');
    replacements.from = from;
  }
  if (to) {
    conds.push('r.created_at < :to');
    replacements.to = to;
  }
  if (t.kind === 'window' && !from) throw invalid('Give the window a start.', { from: 'When did it start?' });
  replacements.errors = JSON.stringify(t.errors);
  return {
    kind: t.kind,
    label: t.label,
    subject: t.subject,
    where: t.kind === 'lot' ? null : conds.join(' AND '),
    replacements,
    from,
    to,
    errors: t.errors,
    guardBand: t.guardBand,
    lotId: t.lotId,
  };
}

/**
 * A gauge's readings since its last good calibration (unless a start is given), with its as-found
 * error as the guard band in every unit it converts to.
 */
async function gaugeTrigger(t: Trigger, q: BlastQuery, code: string, transaction?: Transaction) {
  t.kind = 'gauge';
  const gauge = await Gauge.findOne({ where: { code }, transaction });
  if (!gauge) throw notFound(`Gauge ${code}`);
  const { bad, lastGood } = await gaugeWindow(gauge, transaction);
  t.conds.push('r.gauge_id = :gaugeId');
  t.subject = `gauge ${gauge.code}`;
  t.replacements.gaugeId = gauge.id;
  if (!q.from && lastGood) {
    // the whole day of the last good calibration, in the plant's time zone: a reading that morning counts
    const [row] = await (Gauge.sequelize as Sequelize).query<{ at: Date }>(
      `SELECT (:day::date)::timestamp AT TIME ZONE :tz AS at`,
      { type: QueryTypes.SELECT, replacements: { day: lastGood.calibratedOn, tz: t.replacements.tz }, transaction },
    );
    t.from = row!.at;
  }
  const error = bad ? Number(bad.asFoundError) : 0;
  t.guardBand = { error, unit: gauge.unit };
  for (const u of UNITS) {
    const f = conversionFactor(gauge.unit, u);
    if (f !== null) t.errors[u] = error * f;
  }
  t.label = bad
    ? `Gauge ${gauge.code}, found out of tolerance on ${bad.calibratedOn} (as found off by up to ${Number(bad.asFoundError)} ${gauge.unit ?? ''})`.trim()
    : `Gauge ${gauge.code}`;
  t.label += lastGood && !q.from ? `: readings since its last good calibration on ${lastGood.calibratedOn}` : '';
}

/** A lot, a rule version, an operator or a station; with none of them, a time window. */
async function otherTrigger(t: Trigger, q: BlastQuery, transaction?: Transaction) {
  if (q.lot) {
    t.kind = 'lot';
    const lots = await PartLot.findAll({ where: { lotCode: q.lot }, transaction });
    if (!lots.length) throw notFound(`Lot ${q.lot}`);
    if (lots.length > 1)
      throw invalid(`Lot code ${q.lot} is used by more than one supplier.`, { lot: 'Ambiguous lot code.' });
    t.lotId = lots[0]!.id;
    t.subject = `lot ${lots[0]!.lotCode}`;
    t.label = `Lot ${lots[0]!.lotCode} (${lots[0]!.partKind.replace(/_/g, ' ')})`;
  } else if (q.ruleId) {
    t.kind = 'rule';
    const rule = await ToleranceRule.findByPk(q.ruleId, { transaction });
    if (!rule) throw notFound(`Rule ${q.ruleId}`);
    t.conds.push('r.tolerance_rule_id = :ruleId');
    t.replacements.ruleId = rule.id;
    t.subject = `rule ${rule.id} v${rule.version}`;
    t.label = `Rule version ${rule.version} (rule ${rule.id})`;
  } else if (q.operatorId) {
    t.kind = 'operator';
    const user = await User.findByPk(q.operatorId, { attributes: ['id', 'name'], transaction });
    if (!user) throw notFound(`Person ${q.operatorId}`);
    t.conds.push('sr.operator_id = :operatorId');
    t.replacements.operatorId = user.id;
    t.subject = `readings by ${user.name}`.slice(0, 60);
    t.label = `Readings taken by ${user.name}`;
  } else if (q.station) {
    t.kind = 'station';
    const station = await Station.findOne({ where: { code: q.station }, transaction });
    if (!station) throw notFound(`Station ${q.station}`);
    t.conds.push('sr.station_id = :stationId');
    t.replacements.stationId = station.id;
    t.subject = `station ${station.code}`;
    t.label = `Readings taken at ${station.name}`;
  }
}
