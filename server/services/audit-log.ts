import { QueryTypes, type Sequelize } from 'sequelize';
import type { z } from 'zod';
import type { AuditEvent as AuditJson, listAuditQuery } from '../../shared/schemas/audit.js';

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
  const filter = where.length ? `WHERE ${where.join(' AND ')}` : '';
  const [rows, [count]] = await Promise.all([
    sequelize.query<AuditJson>(
      `SELECT e.id, e.occurred_at AS "occurredAt", e.actor_id AS "actorId", u.name AS "actorName",
              e.actor_role AS "actorRole", e.action, e.entity, e.entity_id AS "entityId", e.before, e.after,
              e.request_id AS "requestId", e.hash, l.leaf_index AS "leafIndex"
         FROM audit_events e LEFT JOIN users u ON u.id = e.actor_id
         LEFT JOIN audit_leaves l ON l.event_id = e.id
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
