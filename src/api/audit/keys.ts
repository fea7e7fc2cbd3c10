import type { AuditFilter } from './audit-events';

export const auditKeys = {
  all: ['audit'] as const,
  events: (filter: AuditFilter) => ['audit', 'events', filter] as const,
  actors: ['audit', 'actors'] as const,
  verify: ['audit', 'verify'] as const,
  log: ['audit', 'log'] as const,
  publishedHead: ['audit', 'published-head'] as const,
};
