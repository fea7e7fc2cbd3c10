import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { TeardownBody } from '../../../shared/schemas/intake';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { itemKeys } from '../items/keys';
import { coreKeys } from './keys';
import type { CoreDetail } from './types';

export const tearDownCore = ({ serial, body }: { serial: string; body: TeardownBody }) =>
  http<CoreDetail>(`/api/cores/${encodeURIComponent(serial)}/teardown`, { method: 'POST', body });

/** The core changes status and gains parts; the log, the item view and the trail all show it. */
export function useTearDownCore() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: tearDownCore,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: coreKeys.all }),
        queryClient.invalidateQueries({ queryKey: itemKeys.all }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]),
  });
}
