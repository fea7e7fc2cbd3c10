import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AuditActor } from '../../../shared/schemas/audit';
import { http } from '../../lib/http';
import { auditKeys } from './keys';

export const auditActorsQueryOptions = () =>
  queryOptions({
    queryKey: auditKeys.actors,
    queryFn: ({ signal }) => http<{ rows: AuditActor[] }>('/api/audit/actors', { signal }),
  });

/** Everyone with an event in the trail, for the person filter. */
export const useAuditActors = () => useQuery(auditActorsQueryOptions());
