import type { Sequelize } from 'sequelize';
import { listAuditQuery } from '../../shared/schemas/audit.js';
import { verifyAuditChain } from '../audit.js';
import type { Api } from '../http/api.js';
import { listAuditEvents } from '../services/audit-log.js';

export function auditRoutes(api: Api, sequelize: Sequelize) {
  api.define({
    method: 'get',
    path: '/audit/events',
    access: 'audit.read',
    summary: 'The audit trail, newest first, filtered by entity, entity id or actor.',
    query: listAuditQuery,
    handler: ({ query }) => listAuditEvents(sequelize, query),
  });
  api.define({
    method: 'get',
    path: '/audit/verify',
    access: 'audit.verify',
    summary: 'Walk the hash chain and report the first broken link, if any.',
    handler: () => verifyAuditChain(sequelize),
  });
}
