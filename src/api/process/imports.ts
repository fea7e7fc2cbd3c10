import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { ProcessImportJson } from '../../../shared/schemas/process-document';
import type { approveChangeBody } from '../../../shared/schemas/process';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { referenceKeys } from '../reference/keys';
import { processKeys } from './keys';

/** The plant's whole process definition, as the document the API exports. */
export const fetchProcessDocument = () => http<Record<string, unknown>>('/api/process/document');

/** What a document that fits the plant would add (the check changes nothing). */
export type DocumentCheckJson = {
  ok: true;
  new: { partKinds: number; families: number; stages: number };
  routes: number;
  characteristics: number;
  castingNumbers: number;
};
export const checkProcessDocument = (doc: unknown) =>
  http<DocumentCheckJson>('/api/process/document/check', { method: 'POST', body: doc });

export const importsQueryOptions = () =>
  queryOptions({
    queryKey: processKeys.imports,
    queryFn: ({ signal }) => http<ProcessImportJson[]>('/api/process/imports', { signal }),
  });
export const useImports = () => useQuery(importsQueryOptions());

/** An import changes the process lists, the reference data the floor reads, and the audit log. */
function useImportMutation<V>(mutationFn: (v: V) => Promise<ProcessImportJson>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: processKeys.all }),
        queryClient.invalidateQueries({ queryKey: referenceKeys.stages }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]),
  });
}

export const useDraftImport = () =>
  useImportMutation(({ doc, note }: { doc: unknown; note: string }) =>
    http<ProcessImportJson>('/api/process/imports', { method: 'POST', body: doc, query: { note } }),
  );
export const useDiscardImport = () =>
  useImportMutation((id: number) => http<ProcessImportJson>(`/api/process/imports/${id}/discard`, { method: 'POST' }));
export const useApproveImport = () =>
  useImportMutation(({ id, ...body }: z.output<typeof approveChangeBody> & { id: number }) =>
    http<ProcessImportJson>(`/api/process/imports/${id}/approve`, { method: 'POST', body }),
  );
