import type { AuditFilter } from '../../../api/audit/audit-events';

export const AUDIT_PAGE_SIZE = 50;

export { ACTION_LABELS, ENTITY_LABELS, recordName } from './words';

export function auditFilterFrom(params: URLSearchParams): AuditFilter {
  const page = Number(params.get('page'));
  const actorId = Number(params.get('actorId'));
  const entity = params.get('entity')?.trim();
  const entityId = params.get('entityId')?.trim();
  const day = (key: string) => {
    const v = params.get(key) ?? '';
    return /^\d{4}-\d{2}-\d{2}$/.test(v) ? v : undefined;
  };
  const from = day('from');
  const to = day('to');
  return {
    page: Number.isInteger(page) && page > 0 ? page : 1,
    pageSize: AUDIT_PAGE_SIZE,
    ...(entity ? { entity } : {}),
    ...(entityId ? { entityId } : {}),
    ...(Number.isInteger(actorId) && actorId > 0 ? { actorId } : {}),
    ...(from ? { from } : {}),
    ...(to ? { to } : {}),
  };
}
