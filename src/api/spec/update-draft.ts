import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { RuleJson, RuleLimits } from '../../../shared/schemas/spec';
import { http } from '../../lib/http';
import { afterRuleChange } from './invalidate';

/** Drafts only: the server refuses an approved version with 409. */
export const updateDraft = ({ id, limits }: { id: number; limits: RuleLimits }) =>
  http<RuleJson>(`/api/spec/rules/${id}`, { method: 'PATCH', body: { limits } });

export function useUpdateDraft() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: updateDraft, onSuccess: () => afterRuleChange(queryClient) });
}
