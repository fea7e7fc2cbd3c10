import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { RuleJson } from '../../../shared/schemas/spec';
import { http } from '../../lib/http';
import { afterRuleChange } from './invalidate';

/** The draft stays on record as discarded; its version number is not used again. */
export const discardDraft = (id: number) => http<RuleJson>(`/api/spec/rules/${id}/discard`, { method: 'POST' });

export function useDiscardDraft() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: discardDraft, onSettled: () => afterRuleChange(queryClient) });
}
