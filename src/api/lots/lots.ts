import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { AttachmentJson } from '../../../shared/schemas/attachments';
import type { Paged } from '../../../shared/schemas/common';
import type {
  InspectionBody,
  InspectionState,
  ReceivedLotDetailJson,
  ReceivedLotJson,
  ReceiveLotBody,
} from '../../../shared/schemas/lots';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';

export type LotFilter = {
  q?: string;
  supplierId?: number;
  inspection?: InspectionState;
  available?: 'true';
  page: number;
  pageSize: number;
};

export const lotKeys = {
  all: ['received-lots'] as const,
  list: (f: LotFilter) => ['received-lots', 'list', f] as const,
  one: (id: number) => ['received-lots', 'detail', id] as const,
};

export const lotsQueryOptions = (f: LotFilter) =>
  queryOptions({
    queryKey: lotKeys.list(f),
    queryFn: ({ signal }) => http<Paged<ReceivedLotJson>>('/api/receiving/lots', { query: f, signal }),
    placeholderData: keepPreviousData,
  });
export const useLots = (f: LotFilter) => useQuery(lotsQueryOptions(f));

export const lotQueryOptions = (id: number) =>
  queryOptions({
    queryKey: lotKeys.one(id),
    queryFn: ({ signal }) => http<ReceivedLotDetailJson>(`/api/receiving/lots/${id}`, { signal }),
  });
export const useLot = (id: number) => useQuery(lotQueryOptions(id));

/** Receiving logs a lot; the lists are asked again. */
export function useReceiveLot() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: ReceiveLotBody) => http<ReceivedLotDetailJson>('/api/receiving/lots', { method: 'POST', body }),
    onSuccess: (lot) => {
      queryClient.setQueryData(lotKeys.one(lot.id), lot);
      void queryClient.invalidateQueries({ queryKey: lotKeys.all });
      void queryClient.invalidateQueries({ queryKey: auditKeys.all });
    },
  });
}

export function useSetInspection(id: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: InspectionBody) =>
      http<ReceivedLotDetailJson>(`/api/receiving/lots/${id}/inspection`, { method: 'POST', body }),
    onSuccess: (lot) => {
      queryClient.setQueryData(lotKeys.one(lot.id), lot);
      void queryClient.invalidateQueries({ queryKey: lotKeys.all });
      void queryClient.invalidateQueries({ queryKey: auditKeys.all });
    },
  });
}

/** The certificate goes up when chosen, checked as a PDF by its bytes; the lot claims it on save. */
export function useUploadCertificate() {
  return useMutation({
    mutationFn: (file: File) => {
      const form = new FormData();
      form.append('file', file);
      return http<AttachmentJson>('/api/receiving/certificates', { method: 'POST', body: form });
    },
  });
}
