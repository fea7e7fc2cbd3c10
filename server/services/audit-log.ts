import { QueryTypes, type Sequelize } from 'sequelize';
import type { z } from 'zod';
import type { AuditActor, AuditEvent as AuditJson, listAuditQuery } from '../../shared/schemas/audit.js';
import { plantSettings } from './plant.js';

/**
 * A record named in the trade's words where its id alone says little: a person by name, a stage
 * result by its stage and serial, a rule by its characteristic, family and version. Ids that are
 * not numbers (serials, NCR numbers) never reach the casts: CASE keeps the order.
 */
const RECORD_LABEL = `
  SELECT ru.name AS label FROM users ru
   WHERE e.entity = 'user' AND ru.id = CASE WHEN e.entity_id ~ '^[0-9]{1,9}$' THEN e.entity_id::int END
  UNION ALL
  SELECT st.name || ' result of ' || i.serial FROM stage_results sr
    JOIN items i ON i.id = sr.item_id JOIN stages st ON st.id = sr.stage_id
   WHERE e.entity = 'stage_result' AND sr.id = CASE WHEN e.entity_id ~ '^[0-9]{1,9}$' THEN e.entity_id::int END
  UNION ALL
  SELECT c.name || ', ' || f.code || ' v' || tr.version FROM tolerance_rules tr
    JOIN characteristics c ON c.id = tr.characteristic_id JOIN engine_families f ON f.id = tr.engine_family_id
   WHERE e.entity = 'tolerance_rule' AND tr.id = CASE WHEN e.entity_id ~ '^[0-9]{1,9}$' THEN e.entity_id::int END
  LIMIT 1`;

/** The audit trail, newest first, with the actor's name; filters are exact matches. */
export async function listAuditEvents(sequelize: Sequelize, query: z.output<typeof listAuditQuery>) {
  const where: string[] = [];
  const replacements: Record<string, unknown> = { limit: query.pageSize, offset: (query.page - 1) * query.pageSize };
  const filters = { entity: 'e.entity', entityId: 'e.entity_id', actorId: 'e.actor_id' } as const;
  for (const [key, column] of Object.entries(filters) as [keyof typeof filters, string][]) {
    if (query[key] === undefined) continue;
    where.push(`${column} = :${key}`);
    replacements[key] = query[key];
  }
  // calendar days in the plant's zone, both ends included
  if (query.from || query.to) replacements.zone = (await plantSettings()).timeZone;
  if (query.from) {
    where.push(`e.occurred_at >= (CAST(:from AS date)::timestamp AT TIME ZONE :zone)`);
    replacements.from = query.from;
  }
  if (query.to) {
    where.push(`e.occurred_at < ((CAST(:to AS date) + 1)::timestamp AT TIME ZONE :zone)`);
    replacements.to = query.to;
  }
  const filter = where.length ? `WHERE ${where.join(' AND ')}` : '';
  const [rows, [count]] = await Promise.all([
    sequelize.query<AuditJson>(
      `SELECT e.id, e.occurred_at AS "occurredAt", e.actor_id AS "actorId", u.name AS "actorName",
              e.actor_role AS "actorRole", e.action, e.entity, e.entity_id AS "entityId", e.before, e.after,
              e.request_id AS "requestId", e.hash, l.leaf_index AS "leafIndex", rec.label AS "recordLabel"
         FROM audit_events e LEFT JOIN users u ON u.id = e.actor_id
         LEFT JOIN audit_leaves l ON l.event_id = e.id
         LEFT JOIN LATERAL (${RECORD_LABEL}) rec ON true
         ${filter} ORDER BY e.id DESC LIMIT :limit OFFSET :offset`,
      { type: QueryTypes.SELECT, replacements },
    ),
    sequelize.query<{ total: number }>(`SELECT count(*)::int AS total FROM audit_events e ${filter}`, {
      type: QueryTypes.SELECT,
      replacements,
    }),
  ]);
  return {
    rows: rows.map((r) => ({ ...r, occurredAt: new Date(r.occurredAt).toISOString() })),
    total: count?.total ?? 0,
    page: query.page,
    pageSize: query.pageSize,
  };
}

/** Everyone who has an event in the trail (deactivated people included), by name. */
export async function listAuditActors(sequelize: Sequelize): Promise<{ rows: AuditActor[] }> {
  const rows = await sequelize.query<AuditActor>(
    `SELECT u.id, u.name, u.role, u.active FROM users u
      WHERE EXISTS (SELECT 1 FROM audit_events e WHERE e.actor_id = u.id)
      ORDER BY u.name, u.id`,
    { type: QueryTypes.SELECT },
  );
  return { rows };
}
