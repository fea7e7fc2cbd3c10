import { queryOptions, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CauseCodeJson } from '../../../shared/schemas/warranty';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { warrantyKeys } from './keys';

export const fetchCauseCodes = (signal?: AbortSignal) => http<CauseCodeJson[]>('/api/warranty/cause-codes', { signal });

export const causeCodesQueryOptions = () =>
  queryOptions({ queryKey: warrantyKeys.causeCodes, queryFn: ({ signal }) => fetchCauseCodes(signal) });

export const useCauseCodes = () => useQuery(causeCodesQueryOptions());

export function useAfterCauseCode() {
  const queryClient = useQueryClient();
  return () => {
    void queryClient.invalidateQueries({ queryKey: warrantyKeys.causeCodes });
    void queryClient.invalidateQueries({ queryKey: auditKeys.all });
  };
}
