import type { Sequelize } from 'sequelize';
import type { AlertsJson, NcrAgeJson, ShippingJson, ShipRow, TeardownQueueRow } from '../../../shared/schemas/line.js';
import { Item } from '../../models/index.js';
import { readQuery } from '../../read/read-query.js';
import { plantSettings } from '../plant.js';
import { releaseCheck } from '../release/index.js';

/** Cores received and accepted, not yet torn down: oldest first. */
export async function teardownQueue(sequelize: Sequelize): Promise<{ rows: TeardownQueueRow[]; total: number }> {
  const rows = await readQuery<{
    serial: string;
    family_code: string;
    casting_number: string;
    source: string;
    source_reference: string | null;
    received_on: string;
    age_days: number;
    total: number;
  }>(
    sequelize,
    `SELECT i.serial, f.code AS family_code, cr.casting_number, cr.source, cr.source_reference,
            to_char(cr.received_on, 'YYYY-MM-DD') AS received_on,
            (current_date - cr.received_on)::int AS age_days, count(*) OVER ()::int AS total
       FROM items i
       JOIN core_receipts cr ON cr.item_id = i.id
       JOIN engine_families f ON f.id = i.engine_family_id
      WHERE i.kind = 'core' AND i.status = 'received'
      ORDER BY cr.received_on, i.id
      LIMIT 50`,
  );
  return {
    total: rows[0]?.total ?? 0,
    rows: rows.map((r) => ({
      serial: r.serial,
      familyCode: r.family_code,
      castingNumber: r.casting_number,
      source: r.source,
      sourceReference: r.source_reference,
      receivedOn: r.received_on,
      ageDays: r.age_days,
    })),
  };
}

const NCR_BUCKETS = [
  { label: 'Under 2 days', below: 2 },
  { label: '2–7 days', below: 7 },
  { label: '7–30 days', below: 30 },
  { label: 'Over 30 days', below: 100_000 },
];

/** Open NCRs counted by age, and the oldest ones. */
export async function ncrAges(sequelize: Sequelize): Promise<NcrAgeJson> {
  const [counts, oldest] = await Promise.all([
    readQuery<{ bucket: number; count: number }>(
      sequelize,
      `SELECT width_bucket(extract(epoch FROM now() - created_at) / 86400.0, ARRAY[2, 7, 30]::float8[]) AS bucket,
              count(*)::int AS count
         FROM nonconformances WHERE state IN ('raised','in_review','decided') GROUP BY 1`,
    ),
    readQuery<{
      number: string;
      serial: string | null;
      lot_code: string | null;
      state: string;
      age_days: number;
      description: string;
    }>(
      sequelize,
      `SELECT n.number, i.serial, pl.lot_code, n.state, floor(extract(epoch FROM now() - n.created_at) / 86400)::int AS age_days,
              left(n.description, 140) AS description
         FROM nonconformances n
         LEFT JOIN items i ON i.id = n.item_id
         LEFT JOIN part_lots pl ON pl.id = n.part_lot_id
        WHERE n.state IN ('raised','in_review','decided')
        ORDER BY n.created_at, n.id LIMIT 8`,
    ),
  ]);
  return {
    buckets: NCR_BUCKETS.map((b, i) => ({ label: b.label, count: counts.find((c) => c.bucket === i)?.count ?? 0 })),
    oldest: oldest.map((o) => ({
      number: o.number,
      serial: o.serial,
      lotCode: o.lot_code,
      state: o.state,
      ageDays: o.age_days,
      description: o.description,
    })),
  };
}

/** Open NCRs past the plant's overdue age, and parts held longer than its hold threshold. */
export async function alerts(sequelize: Sequelize): Promise<AlertsJson> {
  const plant = await plantSettings();
  const rows = await readQuery<{
    kind: 'ncr_overdue' | 'hold_old';
    ref: string;
    what: string;
    age_hours: number;
    total: number;
  }>(
    sequelize,
    `WITH a AS (
       SELECT 'ncr_overdue' AS kind, n.number AS ref, coalesce(i.serial, pl.lot_code) AS what,
              extract(epoch FROM now() - n.created_at) / 3600.0 AS age_hours
         FROM nonconformances n
         LEFT JOIN items i ON i.id = n.item_id
         LEFT JOIN part_lots pl ON pl.id = n.part_lot_id
        WHERE n.state IN ('raised','in_review','decided') AND n.created_at < now() - make_interval(days => :days)
       UNION ALL
       SELECT 'hold_old', i.serial, h.number, extract(epoch FROM now() - h.at) / 3600.0
         FROM items i
         JOIN LATERAL (SELECT n.number, n.created_at AS at FROM nonconformances n
                        WHERE n.item_id = i.id AND n.state IN ('raised','in_review','decided')
                        ORDER BY n.created_at LIMIT 1) h ON true
        WHERE i.status = 'on_hold' AND h.at < now() - make_interval(hours => :hours))
     SELECT kind, ref, what, round(age_hours::numeric, 1)::float AS age_hours, count(*) OVER ()::int AS total
       FROM a ORDER BY age_hours DESC, ref LIMIT 30`,
    { days: plant.ncrOverdueDays, hours: plant.holdAlertHours },
  );
  return {
    ncrOverdueDays: plant.ncrOverdueDays,
    holdAlertHours: plant.holdAlertHours,
    total: rows[0]?.total ?? 0,
    alerts: rows.map((r) => ({
      kind: r.kind,
      ageHours: Number(r.age_hours),
      link: r.kind === 'ncr_overdue' ? `/ncrs/${r.ref}` : `/items/${r.ref}`,
      message:
        r.kind === 'ncr_overdue'
          ? `${r.ref} on ${r.what ?? 'a lot'} has been open ${Math.floor(Number(r.age_hours) / 24)} days (overdue after ${plant.ncrOverdueDays}).`
          : `${r.ref} has been on hold ${Math.floor(Number(r.age_hours))} hours under ${r.what} (alert after ${plant.holdAlertHours}).`,
    })),
  };
}

const SHIP_LIMIT = 60;

/**
 * Long blocks built and not shipped, each through the release gate itself, so the reasons here are
 * the ones the release screen gives. Oldest first; a plant has tens of these, not thousands.
 */
export async function shippingBoard(sequelize: Sequelize): Promise<ShippingJson> {
  const units = await readQuery<{
    id: number;
    serial: string;
    family_code: string;
    status: string;
    stage_name: string | null;
    age_hours: number;
  }>(
    sequelize,
    `SELECT i.id, i.serial, f.code AS family_code, i.status, s.name AS stage_name,
            round(extract(epoch FROM now() - i.created_at) / 3600.0, 1)::float AS age_hours
       FROM items i
       JOIN engine_families f ON f.id = i.engine_family_id
       LEFT JOIN stages s ON s.id = i.current_stage_id
      WHERE i.kind = 'long_block' AND i.status IN ('in_process','on_hold','finished')
      ORDER BY i.created_at, i.id LIMIT ${SHIP_LIMIT + 1}`,
  );
  const more = units.length > SHIP_LIMIT;
  const rows: ShipRow[] = [];
  for (const u of units.slice(0, SHIP_LIMIT)) {
    const unit = await Item.findByPk(u.id);
    if (!unit) continue;
    const check = await releaseCheck(sequelize, unit);
    rows.push({
      serial: u.serial,
      familyCode: u.family_code,
      status: u.status,
      stageName: u.stage_name,
      ageHours: Number(u.age_hours),
      releasable: check.releasable,
      reasons: check.reasons.map((r) => ({ message: r.message, link: r.link })),
    });
  }
  return { ready: rows.filter((r) => r.releasable), blocked: rows.filter((r) => !r.releasable), more };
}
