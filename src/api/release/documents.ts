import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { releaseKeys } from './keys';

export type IssuedDocumentJson = {
  kind: 'build_record' | 'certificate' | 'packing_slip';
  title: string;
  documentNumber: string;
  contentHash: string;
  issuedAt: string;
  auditEventId: number;
};
export type UnitDocumentsJson = { serial: string; released: boolean; documents: IssuedDocumentJson[] };

const url = (serial: string) => `/api/units/${encodeURIComponent(serial)}/documents`;

/** The documents a unit's release issued: build record, certificate of conformance, packing slip. */
export const fetchUnitDocuments = (serial: string, signal?: AbortSignal) =>
  http<UnitDocumentsJson>(url(serial), { signal });

export const unitDocumentsQueryOptions = (serial: string) =>
  queryOptions({
    queryKey: releaseKeys.documents(serial),
    queryFn: ({ signal }) => fetchUnitDocuments(serial, signal),
  });

export const useUnitDocuments = (serial: string) => useQuery(unitDocumentsQueryOptions(serial));

/** Issues them when the release could not (they are logged once; asking again lists them). */
export function useIssueDocuments() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (serial: string) => http<UnitDocumentsJson>(url(serial), { method: 'POST' }),
    onSuccess: (_r, serial) =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: releaseKeys.documents(serial) }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]),
  });
}
