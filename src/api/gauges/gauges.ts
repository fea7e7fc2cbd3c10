import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type {
  BlastQuery,
  BlastRadiusJson,
  CalibrationBody,
  CalibrationJson,
  ContainBody,
  ContainmentJson,
  GaugeBody,
  GaugeJson,
} from '../../../shared/schemas/gauges';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';

export const gaugeKeys = {
  all: ['gauges'] as const,
  list: () => ['gauges', 'list'] as const,
  one: (code: string) => ['gauges', 'detail', code] as const,
  blast: (q: BlastQuery) => ['gauges', 'blast', q] as const,
};

export type GaugeList = { today: string; rows: GaugeJson[] };
export type GaugeDetail = { today: string; gauge: GaugeJson; calibrations: CalibrationJson[] };

export const gaugesQueryOptions = () =>
  queryOptions({
    queryKey: gaugeKeys.list(),
    queryFn: ({ signal }) => http<GaugeList>('/api/gauges', { signal }),
  });
export const useGauges = () => useQuery(gaugesQueryOptions());

export const gaugeQueryOptions = (code: string) =>
  queryOptions({
    queryKey: gaugeKeys.one(code),
    queryFn: ({ signal }) => http<GaugeDetail>(`/api/gauges/${encodeURIComponent(code)}`, { signal }),
  });
export const useGauge = (code: string) => useQuery(gaugeQueryOptions(code));

export const blastQueryOptions = (q: BlastQuery) =>
  queryOptions({
    queryKey: gaugeKeys.blast(q),
    queryFn: ({ signal }) => http<BlastRadiusJson>('/api/blast-radius', { query: q, signal }),
  });
export const useBlastRadius = (q: BlastQuery) => useQuery(blastQueryOptions(q));

/** Registers a gauge; it is unusable until its first calibration is recorded. */
export function useRegisterGauge() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: GaugeBody) => http<GaugeJson>('/api/gauges', { method: 'POST', body }),
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: gaugeKeys.all });
      void queryClient.invalidateQueries({ queryKey: auditKeys.all });
    },
  });
}

export function useRecordCalibration(code: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CalibrationBody) =>
      http<CalibrationJson>(`/api/gauges/${encodeURIComponent(code)}/calibrations`, { method: 'POST', body }),
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: gaugeKeys.all });
      void queryClient.invalidateQueries({ queryKey: auditKeys.all });
    },
  });
}

export function useContain() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: ContainBody) => http<ContainmentJson>('/api/containments', { method: 'POST', body }),
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: gaugeKeys.all });
      void queryClient.invalidateQueries({ queryKey: auditKeys.all });
    },
  });
}

export function useCustomerNotice() {
  return useMutation({
    mutationFn: ({ number, message }: { number: string; message: string }) =>
      http<ContainmentJson & { sent: number }>(`/api/containments/${encodeURIComponent(number)}/notice`, {
        method: 'POST',
        body: { message },
      }),
  });
}
