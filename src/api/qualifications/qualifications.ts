import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type {
  QualificationJson,
  QualificationMatrixJson,
  SignQualificationBody,
} from '../../../shared/schemas/qualifications';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';

export const qualificationKeys = {
  all: ['qualifications'] as const,
  matrix: ['qualifications', 'matrix'] as const,
  expiring: (days: number) => ['qualifications', 'expiring', days] as const,
};

export const fetchMatrix = (signal?: AbortSignal) => http<QualificationMatrixJson>('/api/qualifications', { signal });

export const matrixQueryOptions = () =>
  queryOptions({ queryKey: qualificationKeys.matrix, queryFn: ({ signal }) => fetchMatrix(signal) });

export const useQualificationMatrix = () => useQuery(matrixQueryOptions());

export const fetchExpiring = (days: number, signal?: AbortSignal) =>
  http<QualificationJson[]>('/api/qualifications/expiring', { query: { days }, signal });

export const expiringQueryOptions = (days = 30) =>
  queryOptions({ queryKey: qualificationKeys.expiring(days), queryFn: ({ signal }) => fetchExpiring(days, signal) });

export const useExpiringQualifications = (days = 30, enabled = true) =>
  useQuery({ ...expiringQueryOptions(days), enabled });

export const signQualification = (body: SignQualificationBody) =>
  http<QualificationJson>('/api/qualifications', { method: 'POST', body });

export function useSignQualification() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signQualification,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: qualificationKeys.all }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]),
  });
}

export const withdrawQualification = ({ id, ...body }: { id: number; reason: string; password: string }) =>
  http<QualificationJson>(`/api/qualifications/${id}/withdraw`, { method: 'POST', body });

export function useWithdrawQualification() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: withdrawQualification,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: qualificationKeys.all }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]),
  });
}
