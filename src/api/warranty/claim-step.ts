import { useMutation, useQueryClient } from '@tanstack/react-query';
import type {
  ClaimJson,
  CloseClaimBody,
  DecideClaimBody,
  ReturnUnitBody,
  TeardownClaimBody,
} from '../../../shared/schemas/warranty';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { trailKeys } from '../trail/keys';
import { warrantyKeys } from './keys';

/**
 * The signed steps after logging (POST /api/warranty/claims/:number/return, /teardown, /decide,
 * /close): each answers the claim as it now stands.
 */
type Steps = {
  return: ReturnUnitBody;
  teardown: TeardownClaimBody;
  decide: DecideClaimBody;
  close: CloseClaimBody;
};

export const claimStep = <S extends keyof Steps>(number: string, step: S, body: Steps[S]) =>
  http<ClaimJson>(`/api/warranty/claims/${encodeURIComponent(number)}/${step}`, { method: 'POST', body });

/** What a claim's change touches: the claim, the lists, the trail, the audit trail. */
export function useAfterClaim() {
  const queryClient = useQueryClient();
  return (claim: ClaimJson) => {
    queryClient.setQueryData(warrantyKeys.claim(claim.number), claim);
    void queryClient.invalidateQueries({ queryKey: warrantyKeys.all });
    void queryClient.invalidateQueries({ queryKey: trailKeys.all });
    void queryClient.invalidateQueries({ queryKey: auditKeys.all });
  };
}

export function useClaimStep<S extends keyof Steps>(number: string, step: S) {
  return useMutation({ mutationFn: (body: Steps[S]) => claimStep(number, step, body), onSuccess: useAfterClaim() });
}
