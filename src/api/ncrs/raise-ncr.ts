import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { NcrDetail, RaiseNcrBody } from '../../../shared/schemas/ncr';
import { http } from '../../lib/http';
import { afterNcrChange } from './ncr-step';

export const raiseNcr = (body: RaiseNcrBody) => http<NcrDetail>('/api/ncrs', { method: 'POST', body });

/** A concern raised by hand: the NCR is new and its part goes on hold at once. */
export function useRaiseNcr() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: raiseNcr, onSuccess: (ncr) => afterNcrChange(queryClient, ncr) });
}
