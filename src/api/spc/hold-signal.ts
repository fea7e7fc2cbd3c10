import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { StoredSignalJson } from '../../../shared/schemas/spc';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { ncrKeys } from '../ncrs/keys';
import { spcKeys } from './keys';

/** An NCR holds the part; 409 when it is already held for this signal. */
export const holdSignal = ({ id, reason }: { id: number; reason: string }) =>
  http<StoredSignalJson>(`/api/spc/signals/${id}/hold`, { method: 'POST', body: { reason } });

export function useHoldSignal() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: holdSignal,
    onSettled: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: spcKeys.all }),
        queryClient.invalidateQueries({ queryKey: ncrKeys.all }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]),
  });
}
