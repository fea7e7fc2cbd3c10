import { QueryTypes, type Sequelize } from 'sequelize';
import type { AuditEvent as AuditJson } from '../../shared/schemas/audit.js';
import { listAuditQuery } from '../../shared/schemas/audit.js';
import { verifyAuditChain } from '../audit.js';
import type { Api } from '../http/api.js';

export function auditRoutes(api: Api, sequelize: Sequelize) {
  api.define({
    method: 'get',
    path: '/audit/events',
    access: 'audit.read',
    summary: 'The audit trail, newest first, filtered by entity, entity id or actor.',
    query: listAuditQuery,
    handler: async ({ query }) => {
      const where: string[] = [];
      const replacements: Record<string, unknown> = { limit: query.pageSize, offset: (query.page - 1) * query.pageSize };
      const filters = { entity: 'e.entity', entityId: 'e.entity_id', actorId: 'e.actor_id' } as const;
      for (const [key, column] of Object.entries(filters) as [keyof typeof filters, string][]) {
        if (query[key] === undefined) continue;
        where.push(`${column} = :${key}`);
        replacements[key] = query[key];
      }
      const filter = where.length ? `WHERE ${where.join(' AND ')}` : '';
      const rows = await sequelize.query<AuditJson & { total: number }>(
        `SELECT e.id, e.occurred_at AS "occurredAt", e.actor_id AS "actorId", u.name AS "actorName",
                e.actor_role AS "actorRole", e.action, e.entity, e.entity_id AS "entityId", e.before, e.after,
                e.request_id AS "requestId", e.hash, count(*) OVER () AS total
           FROM audit_events e LEFT JOIN users u ON u.id = e.actor_id
           ${filter} ORDER BY e.id DESC LIMIT :limit OFFSET :offset`,
        { type: QueryTypes.SELECT, replacements },
      );
      return {
        rows: rows.map(({ total: _t, ...r }) => ({ ...r, occurredAt: new Date(r.occurredAt).toISOString() })),
        total: rows[0]?.total ?? 0,
        page: query.page,
        pageSize: query.pageSize,
      };
    },
  });
  api.define({
    method: 'get',
    path: '/audit/verify',
    access: 'audit.verify',
    summary: 'Walk the hash chain and report the first broken link, if any.',
    handler: () => verifyAuditChain(sequelize),
  });
}
