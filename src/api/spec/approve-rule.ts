import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { approveRuleBody, RuleJson } from '../../../shared/schemas/spec';
import { http } from '../../lib/http';
import { afterRuleChange } from './invalidate';

export type ApproveRuleBody = z.output<typeof approveRuleBody>;

/** A wrong password is refused with 400 `signature_refused` and a note on `password`. */
export const approveRule = ({ id, body }: { id: number; body: ApproveRuleBody }) =>
  http<RuleJson>(`/api/spec/rules/${id}/approve`, { method: 'POST', body });

export function useApproveRule() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: approveRule, onSuccess: () => afterRuleChange(queryClient) });
}
