import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ApproveStudyBody, StudyBody, StudyJson } from '../../../shared/schemas/gauges';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { gaugeKeys } from './gauges';

export const studyKeys = {
  list: (code: string) => ['gauges', 'studies', code] as const,
};

export const studiesQueryOptions = (code: string) =>
  queryOptions({
    queryKey: studyKeys.list(code),
    queryFn: ({ signal }) => http<StudyJson[]>(`/api/gauges/${encodeURIComponent(code)}/studies`, { signal }),
  });
export const useStudies = (code: string) => useQuery(studiesQueryOptions(code));

/** Recording a study changes the gauge's flag too, so the register and the gauge refetch. */
export function useRecordStudy(code: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: StudyBody) =>
      http<StudyJson>(`/api/gauges/${encodeURIComponent(code)}/studies`, { method: 'POST', body }),
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: gaugeKeys.all });
      void queryClient.invalidateQueries({ queryKey: auditKeys.all });
    },
  });
}

export function useApproveStudy(code: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...body }: ApproveStudyBody & { id: number }) =>
      http<StudyJson>(`/api/gauge-studies/${id}/approval`, { method: 'POST', body }),
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: studyKeys.list(code) });
      void queryClient.invalidateQueries({ queryKey: auditKeys.all });
    },
  });
}
