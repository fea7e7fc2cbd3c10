import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { RuleJson, RuleLimits } from '../../../shared/schemas/spec';
import { http } from '../../lib/http';
import { afterRuleChange } from './invalidate';

export type CreateDraft = { family: string; characteristicId: number; limits: RuleLimits };

/** 409 when a draft already exists; the refusal's details carry its `draftId`. */
export const createDraft = (body: CreateDraft) => http<RuleJson>('/api/spec/rules', { method: 'POST', body });

export function useCreateDraft() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createDraft, onSettled: () => afterRuleChange(queryClient) });
}
