import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type {
  BlastPartJson,
  BlastQuery,
  BlastRadiusJson,
  BlastReadingJson,
  WhereNow,
} from '../../../shared/schemas/gauges.js';
import { scopeOf, type Scope } from './scope.js';
import { partsSql, readingsSql, summarySql } from './sql.js';

/**
 * The blast radius: from what went bad — a gauge found out of tolerance as found, a purchased lot,
 * a rule version, an operator, a station, a spell of time — every reading it touched, which
 * verdicts could change with the gauge's as-found error as a guard band, the parts, the units they
 * went into and where each is now.
 */

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
