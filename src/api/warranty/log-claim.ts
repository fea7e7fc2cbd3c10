import { useMutation } from '@tanstack/react-query';
import type { ClaimJson, LogClaimBody } from '../../../shared/schemas/warranty';
import { http } from '../../lib/http';
import { useAfterClaim } from './claim-step';

export const logClaim = (body: LogClaimBody) => http<ClaimJson>('/api/warranty/claims', { method: 'POST', body });

export function useLogClaim() {
  return useMutation({ mutationFn: logClaim, onSuccess: useAfterClaim() });
}
