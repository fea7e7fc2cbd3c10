import { useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import type { NcrDetail } from '../../../shared/schemas/ncr';
import { ApiError, http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { itemKeys } from '../items/keys';
import { ncrKeys } from './keys';

export type NcrStepPath = 'review' | 'disposition' | 'countersign' | 'close' | 'void' | 'assign' | 'containment';

/** Every step on an NCR is a POST to /api/ncrs/:number/<step> answered with the NCR as it now stands. */
export const postNcrStep = <B>(number: string, step: NcrStepPath, body: B) =>
  http<NcrDetail>(`/api/ncrs/${encodeURIComponent(number)}/${step}`, { method: 'POST', body });

/** A step changes the NCR, the lists it appears in, its item's status and the audit trail. */
export async function afterNcrChange(queryClient: QueryClient, ncr: NcrDetail) {
  queryClient.setQueryData(ncrKeys.one(ncr.number), ncr);
  await Promise.all([
    queryClient.invalidateQueries({ queryKey: ncrKeys.lists }),
    queryClient.invalidateQueries({ queryKey: itemKeys.all }),
    queryClient.invalidateQueries({ queryKey: auditKeys.all }),
  ]);
}

/**
 * The hook each step module builds on. A 409 means the NCR moved on meanwhile (someone else took
 * the step, or it closed itself): it is fetched again so the page offers what is possible now.
 */
export function useNcrStep<B>(number: string, step: NcrStepPath) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: B) => postNcrStep(number, step, body),
    onSuccess: (ncr) => afterNcrChange(queryClient, ncr),
    onError: (err) => {
      if (err instanceof ApiError && err.status === 409) {
        void queryClient.invalidateQueries({ queryKey: ncrKeys.one(number) });
      }
    },
  });
}
