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

export async function scopeOf(q: BlastQuery, transaction?: Transaction): Promise<Scope> {
  const tz = (await plantSettings(transaction)).timeZone;
  const conds: string[] = [];
  const replacements: Record<string, unknown> = { tz };
  let from = q.from ? new Date(q.from) : null;
  const to = q.to ? new Date(q.to) : null;
  let kind: TriggerKind = 'window';
  let label = 'Every reading';
  let subject = 'a time window';
  const errors: Record<string, number> = {};
  let guardBand: Scope['guardBand'] = null;
  let lotId: number | null = null;

  if (q.gauge) {
    kind = 'gauge';
    const gauge = await Gauge.findOne({ where: { code: q.gauge }, transaction });
    if (!gauge) throw notFound(`Gauge ${q.gauge}`);
    const { bad, lastGood } = await gaugeWindow(gauge, transaction);
    conds.push('r.gauge_id = :gaugeId');
    subject = `gauge ${gauge.code}`;
    replacements.gaugeId = gauge.id;
    if (!q.from && lastGood) {
      // the whole day of the last good calibration, in the plant's time zone: a reading that morning counts
      const [row] = await (Gauge.sequelize as Sequelize).query<{ at: Date }>(
        `SELECT (:day::date)::timestamp AT TIME ZONE :tz AS at`,
        { type: QueryTypes.SELECT, replacements: { day: lastGood.calibratedOn, tz }, transaction },
      );
      from = row!.at;
    }
    const error = bad ? Number(bad.asFoundError) : 0;
    guardBand = { error, unit: gauge.unit };
    for (const u of UNITS) {
      const f = conversionFactor(gauge.unit, u);
      if (f !== null) errors[u] = error * f;
    }
    label = bad
      ? `Gauge ${gauge.code}, found out of tolerance on ${bad.calibratedOn} (as found off by up to ${Number(bad.asFoundError)} ${gauge.unit ?? ''})`.trim()
      : `Gauge ${gauge.code}`;
    label += lastGood && !q.from ? `: readings since its last good calibration on ${lastGood.calibratedOn}` : '';
  } else if (q.lot) {
    kind = 'lot';
    const lots = await PartLot.findAll({ where: { lotCode: q.lot }, transaction });
    if (!lots.length) throw notFound(`Lot ${q.lot}`);
    if (lots.length > 1)
      throw invalid(`Lot code ${q.lot} is used by more than one supplier.`, { lot: 'Ambiguous lot code.' });
    lotId = lots[0]!.id;
    subject = `lot ${lots[0]!.lotCode}`;
    label = `Lot ${lots[0]!.lotCode} (${lots[0]!.partKind.replace(/_/g, ' ')})`;
  } else if (q.ruleId) {
    kind = 'rule';
    const rule = await ToleranceRule.findByPk(q.ruleId, { transaction });
    if (!rule) throw notFound(`Rule ${q.ruleId}`);
    conds.push('r.tolerance_rule_id = :ruleId');
    replacements.ruleId = rule.id;
    subject = `rule ${rule.id} v${rule.version}`;
    label = `Rule version ${rule.version} (rule ${rule.id})`;
  } else if (q.operatorId) {
    kind = 'operator';
    const user = await User.findByPk(q.operatorId, { attributes: ['id', 'name'], transaction });
    if (!user) throw notFound(`Person ${q.operatorId}`);
    conds.push('sr.operator_id = :operatorId');
    replacements.operatorId = user.id;
    subject = `readings by ${user.name}`.slice(0, 60);
    label = `Readings taken by ${user.name}`;
  } else if (q.station) {
    kind = 'station';
    const station = await Station.findOne({ where: { code: q.station }, transaction });
    if (!station) throw notFound(`Station ${q.station}`);
    conds.push('sr.station_id = :stationId');
    replacements.stationId = station.id;
    subject = `station ${station.code}`;
    label = `Readings taken at ${station.name}`;
  }
  if (from) {
    conds.push('r.created_at >= :from');
    replacements.from = from;
  }
  if (to) {
    conds.push('r.created_at < :to');
    replacements.to = to;
  }
  if (kind === 'window' && !from) throw invalid('Give the window a start.', { from: 'When did it start?' });
  replacements.errors = JSON.stringify(errors);
  return {
    kind,
    label,
    subject,
    where: kind === 'lot' ? null : conds.join(' AND '),
    replacements,
    from,
    to,
    errors,
    guardBand,
    lotId,
  };
}
