import type { AuditFilter } from '../../../api/audit/audit-events';
import { defined, isoDay, pageFrom, positiveInt } from '../../../lib/list-filter';

export const AUDIT_PAGE_SIZE = 50;

export { ACTION_LABELS, ENTITY_LABELS, recordName } from './words';

/** The filters "Clear filters" empties. */
export const AUDIT_FILTERS = ['entity', 'entityId', 'actorId', 'from', 'to'] as const;

export function auditFilterFrom(params: URLSearchParams): AuditFilter {
  return defined({
    page: pageFrom(params),
    pageSize: AUDIT_PAGE_SIZE,
    entity: params.get('entity')?.trim(),
    entityId: params.get('entityId')?.trim(),
    actorId: positiveInt(params.get('actorId')),
    from: isoDay(params.get('from')),
    to: isoDay(params.get('to')),
  });
}
