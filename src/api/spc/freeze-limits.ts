import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { freezeLimitsBody, FrozenLimitsJson } from '../../../shared/schemas/spc';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { spcKeys } from './keys';

export type FreezeLimitsInput = z.input<typeof freezeLimitsBody>;

/** The server recomputes the limits from the baseline's readings; 400 when the baseline holds too few parts. */
export const freezeLimits = (body: FreezeLimitsInput) =>
  http<FrozenLimitsJson>('/api/spc/limits', { method: 'POST', body });

export function useFreezeLimits() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: freezeLimits,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: spcKeys.all }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]),
  });
}
