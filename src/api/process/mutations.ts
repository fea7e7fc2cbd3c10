import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type {
  approveChangeBody,
  castingNumberBody,
  characteristicBody,
  partKindBody,
  routeDraftBody,
  stageBody,
  updateStageBody,
} from '../../../shared/schemas/process';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { referenceKeys } from '../reference/keys';
import { processKeys } from './keys';

/** Every process change touches the process lists, the reference data the floor reads, and the audit log. */
function useProcessMutation<V>(mutationFn: (v: V) => Promise<unknown>) {
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

const post = (url: string, body?: unknown) => http<unknown>(url, { method: 'POST', body });

export const useCreatePartKind = () =>
  useProcessMutation((b: z.output<typeof partKindBody>) => post('/api/process/part-kinds', b));
export const useCreateStage = () =>
  useProcessMutation((b: z.output<typeof stageBody>) => post('/api/process/stages', b));
export const useUpdateStage = () =>
  useProcessMutation(({ id, ...b }: z.output<typeof updateStageBody> & { id: number }) =>
    http<unknown>(`/api/process/stages/${id}`, { method: 'PATCH', body: b }),
  );
export const useCreateCharacteristic = () =>
  useProcessMutation((b: z.output<typeof characteristicBody>) => post('/api/process/characteristics', b));
export const useRetireCharacteristic = () =>
  useProcessMutation(({ id, reason }: { id: number; reason: string }) =>
    post(`/api/process/characteristics/${id}/retire`, { reason }),
  );
export const useAddCastingNumber = () =>
  useProcessMutation(({ family, ...b }: z.output<typeof castingNumberBody> & { family: string }) =>
    post(`/api/process/families/${encodeURIComponent(family)}/casting-numbers`, b),
  );
export const useRetireCastingNumber = () =>
  useProcessMutation((id: number) => post(`/api/process/casting-numbers/${id}/retire`));
export const useDraftRoute = () =>
  useProcessMutation((b: z.output<typeof routeDraftBody>) => post('/api/process/routes', b));
export const useDiscardRoute = () => useProcessMutation((id: number) => post(`/api/process/routes/${id}/discard`));
export const useApproveRoute = () =>
  useProcessMutation(({ id, ...b }: z.output<typeof approveChangeBody> & { id: number }) =>
    post(`/api/process/routes/${id}/approve`, b),
  );
