import type { AuditFilter } from '../../../api/audit/audit-events';

export const AUDIT_PAGE_SIZE = 50;

/** What each entity is called on screen; the code stays visible beside it for searching the log. */
export const ENTITY_LABELS: Record<string, string> = {
  user: 'Person',
  station: 'Station',
  engine_family: 'Engine family',
  plant: 'Plant',
  item: 'Cores and parts',
  attachment: 'Photos',
};

/** A record named as a person would say it: "Core CR-…", "Part BK-…", "Photo 5", "Station 3". */
export function recordName(entity: string, entityId: string): string {
  if (entity === 'item') return `${entityId.toUpperCase().startsWith('CR') ? 'Core' : 'Part'} ${entityId}`;
  if (entity === 'attachment') return `Photo ${entityId}`;
  return `${ENTITY_LABELS[entity] ?? entity} ${entityId}`;
}

/** Plain words for the actions Coretrail writes; any other action shows its code alone. */
export const ACTION_LABELS: Record<string, string> = {
  'user.created': 'Person added',
  'user.updated': 'Person changed',
  'user.deactivated': 'Person deactivated',
  'user.password_reset': 'Password set by an administrator',
  'user.password_changed': 'Own password changed',
  'user.signed_in': 'Signed in',
  'user.signed_out': 'Signed out',
  'station.created': 'Station added',
  'station.updated': 'Station changed',
  'family.created': 'Engine family added',
  'family.updated': 'Engine family changed',
  'core.received': 'Core received and accepted',
  'core.rejected': 'Core received and rejected',
  'core.torn_down': 'Core torn down',
  'item.harvested': 'Part taken from a core',
  'label.printed': 'Label printed',
  'label.reprinted': 'Label printed again',
  'attachment.uploaded': 'Photo added',
  'demo.seeded': 'Demo plant loaded',
};

export function auditFilterFrom(params: URLSearchParams): AuditFilter {
  const page = Number(params.get('page'));
  const actorId = Number(params.get('actorId'));
  const entity = params.get('entity')?.trim();
  const entityId = params.get('entityId')?.trim();
  return {
    page: Number.isInteger(page) && page > 0 ? page : 1,
    pageSize: AUDIT_PAGE_SIZE,
    ...(entity ? { entity } : {}),
    ...(entityId ? { entityId } : {}),
    ...(Number.isInteger(actorId) && actorId > 0 ? { actorId } : {}),
  };
}
