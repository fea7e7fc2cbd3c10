import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AuditVerifyReport } from '../../../shared/schemas/audit';
import { http } from '../../lib/http';
import { auditKeys } from './keys';

export const fetchAuditVerify = (signal?: AbortSignal) => http<AuditVerifyReport>('/api/audit/verify', { signal });

/** Walking the chain is on request only, and each request is a fresh walk. */
export const auditVerifyQueryOptions = () =>
  queryOptions({
    queryKey: auditKeys.verify,
    queryFn: ({ signal }) => fetchAuditVerify(signal),
    enabled: false,
    staleTime: 0,
    gcTime: 60_000,
  });

export function useAuditVerify() {
  return useQuery(auditVerifyQueryOptions());
}
