import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { DecideFieldActionBody, FieldActionJson } from '../../../shared/schemas/field-actions';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { trailKeys } from '../trail/keys';
import { fieldActionKeys } from './keys';

export const decideFieldAction = ({ number, body }: { number: string; body: DecideFieldActionBody }) =>
  http<FieldActionJson>(`/api/field-actions/${encodeURIComponent(number)}/decide`, { method: 'POST', body });

export function useDecideFieldAction() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: decideFieldAction,
    onSuccess: (fa) => {
      queryClient.setQueryData(fieldActionKeys.one(fa.number), fa);
      void queryClient.invalidateQueries({ queryKey: fieldActionKeys.all });
      void queryClient.invalidateQueries({ queryKey: trailKeys.all });
      void queryClient.invalidateQueries({ queryKey: auditKeys.all });
    },
  });
}
