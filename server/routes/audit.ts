import type { Sequelize } from 'sequelize';
import { z } from 'zod';
import { consistencyQuery, headsQuery, listAuditQuery } from '../../shared/schemas/audit.js';
import type { Config } from '../config.js';
import type { Api } from '../http/api.js';
import { consistencyBetween, receiptFor } from '../ledger/receipts.js';
import { signerFor } from '../ledger/signer.js';
import { headsPage, latestHead } from '../ledger/store.js';
import { logStatus, verifyAudit } from '../ledger/verify.js';
import { listAuditActors, listAuditEvents } from '../services/audit-log.js';

const eventIdParam = z.strictObject({ id: z.coerce.number().int().positive().max(Number.MAX_SAFE_INTEGER) });

export function auditRoutes(api: Api, sequelize: Sequelize, config: Config) {
  const signer = signerFor(config.AUDIT_SIGNING_KEY);
  const ledger = { signer, headIntervalMs: config.AUDIT_HEAD_INTERVAL_S * 1000 };
  const publishedKey = signer ? { keyId: signer.keyId, publicKey: signer.publicKey } : null;

  api.define({
    method: 'get',
    path: '/audit/events',
    access: 'audit.read',
    summary: 'The audit trail, newest first, filtered by entity, entity id, actor or a range of days.',
    query: listAuditQuery,
    handler: ({ query }) => listAuditEvents(sequelize, query),
  });
  api.define({
    method: 'get',
    path: '/audit/actors',
    access: 'audit.read',
    summary: 'Everyone with an event in the audit trail, by name, for the person filter.',
    handler: () => listAuditActors(sequelize),
  });
  api.define({
    method: 'get',
    path: '/audit/verify',
    access: 'audit.verify',
    summary: 'Check the whole trail: each event against its leaf, the tree, every signed head and the old chain.',
    handler: () => verifyAudit(sequelize, { signer }),
  });
  api.define({
    method: 'get',
    path: '/audit/log',
    access: 'audit.read',
    summary: 'How far the Merkle log has integrated the trail: size, root, events waiting, the latest signed head.',
    handler: () => logStatus(sequelize, signer),
  });
  api.define({
    method: 'get',
    path: '/audit/log/head',
    access: 'public',
    summary: "The plant's public log key and its latest signed log head, for checking documents.",
    handler: async () => ({ key: publishedKey, head: await latestHead(sequelize) }),
  });
  api.define({
    method: 'get',
    path: '/audit/log/heads',
    access: 'audit.read',
    summary: 'The history of signed log heads, oldest first, as JSON for export (page with after and limit).',
    query: headsQuery,
    handler: async ({ query }) => ({
      format: 'coretrail-log-heads/1',
      key: publishedKey,
      heads: await headsPage(sequelize, query.after, query.limit),
    }),
  });
  api.define({
    method: 'get',
    path: '/audit/log/consistency',
    access: 'public',
    summary: 'A consistency proof (RFC 9162) that the log of size from is a prefix of the log of size to.',
    query: consistencyQuery,
    handler: ({ query }) => consistencyBetween(sequelize, query.from, query.to),
  });
  api.define({
    method: 'get',
    path: '/audit/events/:id/proof',
    access: 'audit.read',
    summary: "An event's receipt: its leaf, the inclusion proof to a signed head and the compact code.",
    params: eventIdParam,
    handler: ({ params }) => receiptFor(sequelize, params.id, ledger),
  });
}
