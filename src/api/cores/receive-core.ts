import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ReceiveCoreBody } from '../../../shared/schemas/intake';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { coreKeys } from './keys';
import type { CoreDetail } from './types';

export const receiveCore = (body: ReceiveCoreBody) => http<CoreDetail>('/api/cores', { method: 'POST', body });

export function useReceiveCore() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: receiveCore,
    onSuccess: async (core) => {
      // marked stale but not refetched now: the open form's duplicate check would otherwise find
      // the core just saved and warn about it in the moment before the page moves on
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: coreKeys.all, refetchType: 'none' }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]);
      queryClient.setQueryData(coreKeys.one(core.serial), core);
    },
  });
}
