import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { conversionFactor } from '../../shared/domain/units.js';
import type {
  BlastPartJson,
  BlastQuery,
  BlastRadiusJson,
  BlastReadingJson,
  TriggerKind,
  WhereNow,
} from '../../shared/schemas/gauges.js';
import { invalid, notFound } from '../errors.js';
import { Gauge, GaugeCalibration, PartLot, Station, ToleranceRule, User } from '../models/index.js';
import { plantSettings } from './plant.js';

/**
 * The blast radius: from what went bad — a gauge found out of tolerance as found, a purchased lot,
 * a rule version, an operator, a station, a spell of time — every reading it touched, which
 * verdicts could change with the gauge's as-found error as a guard band, the parts, the units they
 * went into and where each is now. Set-based SQL: the readings are counted and grouped in the
 * database; only the parts and the first readings come back.
 */

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

/** Readings in scope, each with its limits and whether the guard band could turn its verdict. */
export const judgedSql = (s: Scope) => `
  SELECT r.id, r.stage_result_id, r.characteristic_id, r.position, r.value, r.unit, r.verdict, r.gauge_id,
         r.created_at, lim.lower, lim.upper,
         CASE WHEN r.value IS NULL OR e.err IS NULL OR e.err <= 0 THEN false
              WHEN r.verdict = 'pass' THEN (lim.lower IS NOT NULL AND abs(r.value - lim.lower) <= e.err)
                                        OR (lim.upper IS NOT NULL AND abs(r.value - lim.upper) <= e.err)
              ELSE (lim.lower IS NULL OR r.value + e.err >= lim.lower) AND (lim.upper IS NULL OR r.value - e.err <= lim.upper)
         END AS could_change
    FROM readings r
    ${/\bsr\./.test(s.where ?? '') ? 'JOIN stage_results sr ON sr.id = r.stage_result_id' : ''}
    LEFT JOIN tolerance_rules tr ON tr.id = r.tolerance_rule_id
    CROSS JOIN LATERAL (SELECT
      CASE tr.limit_type WHEN 'nominal' THEN tr.nominal - coalesce(tr.minus_tol, 0)
                         WHEN 'range' THEN tr.lower_limit WHEN 'min' THEN tr.lower_limit END AS lower,
      CASE tr.limit_type WHEN 'nominal' THEN tr.nominal + coalesce(tr.plus_tol, 0)
                         WHEN 'range' THEN tr.upper_limit WHEN 'max' THEN tr.upper_limit END AS upper) lim
    CROSS JOIN LATERAL (SELECT (CAST(:errors AS jsonb) ->> r.unit)::numeric AS err) e
   WHERE ${s.where}`;

/** The parts in scope (a CTE `parts`: item_id, readings, could_change) and where each is now: its unit (if built into one), that unit's shipment. */
const PARTS_SELECT = `
  SELECT i.id, i.serial, i.kind, i.status, p.readings, p.could_change, u.id AS unit_id, u.serial AS unit_serial,
         u.status AS unit_status, sh.reference, sh.ship_date, c.name AS customer, c.email AS customer_email
    FROM parts p
    JOIN items i ON i.id = p.item_id
    LEFT JOIN LATERAL (SELECT l.parent_item_id FROM item_links l
                        WHERE l.child_item_id = i.id AND l.link_type = 'installed_in' AND l.removed_at IS NULL
                        LIMIT 1) li ON true
    LEFT JOIN items u ON u.id = coalesce(li.parent_item_id, CASE WHEN i.kind = 'long_block' THEN i.id END)
    LEFT JOIN LATERAL (SELECT s.reference, s.customer_id,
                              to_char(coalesce(s.ship_date, (s.shipped_at AT TIME ZONE :tz)::date), 'YYYY-MM-DD') AS ship_date
                         FROM shipments s WHERE s.unit_item_id = u.id AND s.returned_at IS NULL
                        ORDER BY s.id DESC LIMIT 1) sh ON true
    LEFT JOIN customers c ON c.id = sh.customer_id
   ORDER BY p.could_change DESC, i.serial`;

// readings counted by result first, so only the results (not every reading) look up their part
const PARTS_OF_READINGS = `parts AS (
    SELECT sr.item_id, sum(g.readings)::int AS readings, sum(g.could_change)::int AS could_change
      FROM (SELECT stage_result_id, count(*) AS readings, count(*) FILTER (WHERE could_change) AS could_change
              FROM j GROUP BY stage_result_id) g
      JOIN stage_results sr ON sr.id = g.stage_result_id
     GROUP BY sr.item_id)`;

/** The parts in scope and where each is now: its unit (if built into one), that unit's shipment. */
export const partsSql = (s: Scope) => `
  WITH ${
    s.lotId
      ? `parts AS (SELECT ul.unit_item_id AS item_id, 0 AS readings, 0 AS could_change FROM unit_lots ul
                    WHERE ul.part_lot_id = :lotId GROUP BY ul.unit_item_id)`
      : `j AS (${judgedSql(s)}), ${PARTS_OF_READINGS}`
  }
  ${PARTS_SELECT}`;

export type PartRow = {
  id: number;
  serial: string;
  kind: string;
  status: string;
  readings: number;
  could_change: number;
  unit_id: number | null;
  unit_serial: string | null;
  unit_status: string | null;
  reference: string | null;
  ship_date: string | null;
  customer: string | null;
  customer_email: string | null;
};

export function whereNow(p: Pick<PartRow, 'status' | 'unit_status' | 'reference'>): WhereNow {
  if (p.status === 'scrapped' || p.unit_status === 'scrapped') return 'scrapped';
  if (p.reference || p.status === 'shipped' || p.unit_status === 'shipped') return 'shipped';
  if (p.status === 'on_hold' || p.unit_status === 'on_hold') return 'on_hold';
  return 'in_plant';
}

export async function blastParts(sequelize: Sequelize, s: Scope, transaction?: Transaction) {
  return sequelize.query<PartRow>(partsSql(s), {
    type: QueryTypes.SELECT,
    replacements: { ...s.replacements, lotId: s.lotId },
    transaction,
  });
}

/** Readings (`from`: judged rows) with their names, most doubtful first (`:limit` of them unless `limit` is null). */
const readingsSelect = (from: string, limit: number | null) => `
  SELECT i.serial, st.name AS stage, c.name AS characteristic, j.position, j.value, j.unit, j.verdict,
         j.lower, j.upper, j.could_change, j.created_at, u.name AS operator, g.code AS gauge, j.id
    FROM ${from} j
    JOIN stage_results sr ON sr.id = j.stage_result_id
    JOIN items i ON i.id = sr.item_id
    JOIN stages st ON st.id = sr.stage_id
    JOIN characteristics c ON c.id = j.characteristic_id
    JOIN users u ON u.id = sr.operator_id
    LEFT JOIN gauges g ON g.id = j.gauge_id
   ORDER BY j.could_change DESC, j.created_at DESC, j.id DESC
   ${limit === null ? '' : 'LIMIT :limit'}`;

/** The readings in scope with their names, most doubtful first (`:limit` of them unless `limit` is null). */
export const readingsSql = (s: Scope, limit: number | null) =>
  readingsSelect(limit === null ? `(${judgedSql(s)})` : firstJudged(`(${judgedSql(s)})`), limit);

// the most doubtful `:limit` judged readings before their names are looked up
const firstJudged = (from: string) =>
  `(SELECT * FROM ${from} jj ORDER BY jj.could_change DESC, jj.created_at DESC, jj.id DESC LIMIT :limit)`;

/** Where a placed part is now, as whereNow() says it, for counting in SQL. */
const WHERE_NOW_SQL = `CASE WHEN x.status = 'scrapped' OR x.unit_status = 'scrapped' THEN 'scrapped'
  WHEN x.reference IS NOT NULL OR x.status = 'shipped' OR x.unit_status = 'shipped' THEN 'shipped'
  WHEN x.status = 'on_hold' OR x.unit_status = 'on_hold' THEN 'on_hold' ELSE 'in_plant' END`;

/**
 * The whole summary of readings in scope in one statement: the readings are judged once (a
 * materialized CTE), the parts placed once; then counted, the parts counted by where they are now,
 * the shipped units grouped by customer, and the first `:partLimit` parts and `:limit` readings
 * named, each as JSON. A gauge used on 5 % of six months' readings touches thousands of parts: the
 * screen shows the most doubtful few hundred and the counts of all; the files have every one.
 */
export const summarySql = (s: Scope) => `
  WITH j AS MATERIALIZED (${judgedSql(s)}), ${PARTS_OF_READINGS},
  placed AS MATERIALIZED (${PARTS_SELECT})
  SELECT (SELECT count(*)::int FROM j) AS readings,
         (SELECT (count(*) FILTER (WHERE could_change))::int FROM j) AS could_change,
         (SELECT json_build_object('parts', count(*), 'units', count(DISTINCT x.unit_id),
                   'inPlant', count(*) FILTER (WHERE ${WHERE_NOW_SQL} = 'in_plant'),
                   'onHold', count(*) FILTER (WHERE ${WHERE_NOW_SQL} = 'on_hold'),
                   'shipped', count(*) FILTER (WHERE ${WHERE_NOW_SQL} = 'shipped'))
            FROM placed x) AS counts,
         (SELECT coalesce(json_agg(x ORDER BY x.could_change DESC, x.serial), '[]')
            FROM (SELECT * FROM placed ORDER BY could_change DESC, serial LIMIT :partLimit) x) AS parts,
         (SELECT coalesce(json_agg(json_build_object('name', c.name, 'email', c.email, 'units', c.units) ORDER BY c.first), '[]')
            FROM (SELECT u.name, min(u.email) AS email, min(u.rank) AS first,
                         json_agg(json_build_object('serial', u.unit_serial, 'shipDate', u.ship_date, 'order', u.reference)
                                  ORDER BY u.rank) AS units
                    FROM (SELECT coalesce(p.customer, '(no customer on file)') AS name, p.customer_email AS email,
                                 p.unit_serial, p.ship_date, p.reference,
                                 min(p.rank) AS rank
                            FROM (SELECT placed.*, row_number() OVER (ORDER BY could_change DESC, serial) AS rank FROM placed) p
                           WHERE p.reference IS NOT NULL AND p.unit_serial IS NOT NULL
                           GROUP BY 1, 2, 3, 4, 5) u
                   GROUP BY u.name) c) AS customers,
         (SELECT coalesce(json_agg(y ORDER BY y.could_change DESC, y.created_at DESC, y.id DESC), '[]')
            FROM (${readingsSelect(firstJudged('j'), 0)}) y) AS named`;

type ReadingRow = {
  serial: string;
  stage: string;
  characteristic: string;
  position: string;
  value: string | number | null;
  unit: string | null;
  verdict: 'pass' | 'fail';
  lower: string | number | null;
  upper: string | number | null;
  could_change: boolean;
  /** a Date from a row, an ISO string from JSON */
  created_at: Date | string;
  operator: string;
  gauge: string | null;
};

const n = (v: string | number | null) => (v === null ? null : Number(v));

/** The readings in scope with names, most doubtful first; `limit` null for all (the CSV). */
export async function blastReadings(sequelize: Sequelize, s: Scope, limit: number | null): Promise<BlastReadingJson[]> {
  if (!s.where) return [];
  const rows = await sequelize.query<ReadingRow>(readingsSql(s, limit), {
    type: QueryTypes.SELECT,
    replacements: { ...s.replacements, limit },
  });
  return rows.map(presentReading);
}

function presentReading(r: ReadingRow): BlastReadingJson {
  return {
    serial: r.serial,
    stage: r.stage,
    characteristic: r.characteristic,
    position: r.position,
    value: n(r.value),
    unit: r.unit,
    verdict: r.verdict,
    lower: n(r.lower),
    upper: n(r.upper),
    couldChange: r.could_change,
    takenAt: new Date(r.created_at).toISOString(),
    operator: r.operator,
    gauge: r.gauge,
  };
}

const presentPart = (p: PartRow): BlastPartJson => ({
  serial: p.serial,
  kind: p.kind,
  status: p.status,
  readings: p.readings,
  couldChange: p.could_change,
  unit: p.unit_serial,
  unitStatus: p.unit_status,
  where: whereNow(p),
  customer: p.customer,
  shipDate: p.ship_date,
  order: p.reference,
});

/**
 * The blast radius: the counts of everything in scope, the first `readingLimit` readings and the
 * first `partLimit` parts (most doubtful first; null for every part, as the files need).
 */
export async function blastRadius(
  sequelize: Sequelize,
  q: BlastQuery,
  readingLimit = 200,
  partLimit: number | null = 300,
): Promise<BlastRadiusJson> {
  const s = await scopeOf(q);
  if (!s.where) return lotRadius(sequelize, s);
  // one statement: the readings judged once, then counted, grouped by part and customer, the first named
  const [row] = await sequelize.query<{
    readings: number;
    could_change: number;
    counts: { parts: number; units: number; inPlant: number; onHold: number; shipped: number };
    parts: PartRow[];
    customers: BlastRadiusJson['customers'];
    named: ReadingRow[];
  }>(summarySql(s), {
    type: QueryTypes.SELECT,
    replacements: { ...s.replacements, limit: readingLimit, partLimit },
  });
  const { counts } = row!;
  return {
    trigger: triggerOf(s),
    guardBand: s.guardBand,
    totals: {
      readings: row!.readings,
      couldChange: row!.could_change,
      parts: counts.parts,
      units: counts.units,
      inPlant: counts.inPlant,
      onHold: counts.onHold,
      shipped: counts.shipped,
      customers: row!.customers.length,
    },
    parts: row!.parts.map(presentPart),
    readings: row!.named.map(presentReading),
    customers: row!.customers,
  };
}

const triggerOf = (s: Scope): BlastRadiusJson['trigger'] => ({
  kind: s.kind,
  label: s.label,
  from: s.from?.toISOString() ?? null,
  to: s.to?.toISOString() ?? null,
});

/** A lot's radius: the units it went into (a few hundred at most), placed and counted here. */
async function lotRadius(sequelize: Sequelize, s: Scope): Promise<BlastRadiusJson> {
  const parts = await blastParts(sequelize, s);
  const shown = parts.map(presentPart);
  const units = new Set(parts.map((p) => p.unit_id).filter((v) => v !== null));
  const byCustomer = new Map<string, BlastRadiusJson['customers'][number]>();
  for (const p of parts) {
    if (!p.reference || !p.unit_serial) continue;
    const key = p.customer ?? '(no customer on file)';
    const c = byCustomer.get(key) ?? { name: key, email: p.customer_email, units: [] };
    if (!c.units.some((u) => u.serial === p.unit_serial)) {
      c.units.push({ serial: p.unit_serial, shipDate: p.ship_date!, order: p.reference });
    }
    byCustomer.set(key, c);
  }
  return {
    trigger: triggerOf(s),
    guardBand: s.guardBand,
    totals: {
      readings: 0,
      couldChange: 0,
      parts: parts.length,
      units: units.size,
      inPlant: shown.filter((p) => p.where === 'in_plant').length,
      onHold: shown.filter((p) => p.where === 'on_hold').length,
      shipped: shown.filter((p) => p.where === 'shipped').length,
      customers: byCustomer.size,
    },
    parts: shown,
    readings: [],
    customers: [...byCustomer.values()],
  };
}
