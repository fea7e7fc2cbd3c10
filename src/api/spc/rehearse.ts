import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { RehearsalJson, RehearseBody } from '../../../shared/schemas/spc';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { spcKeys } from './keys';

/** Replays the draft over the period's stored readings and keeps the summary as a record. */
export const rehearseRule = ({ ruleId, body }: { ruleId: number; body: RehearseBody }) =>
  http<RehearsalJson>(`/api/spec/rules/${ruleId}/rehearsals`, { method: 'POST', body });

export function useRehearseRule() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: rehearseRule,
    onSuccess: (_r, { ruleId }) =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: spcKeys.rehearsals(ruleId) }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]),
  });
}
