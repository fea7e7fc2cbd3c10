import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreditRevisionBody, CreditRevisionJson } from '../../../shared/schemas/warranty';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { coreKeys } from '../cores/keys';
import { creditUrl } from './credit';
import { warrantyKeys } from './keys';

export const reviseCredit = ({ serial, body }: { serial: string; body: CreditRevisionBody }) =>
  http<CreditRevisionJson[]>(creditUrl(serial), { method: 'POST', body });

export function useReviseCredit(serial: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: reviseCredit,
    onSuccess: (rows) => {
      queryClient.setQueryData(warrantyKeys.credit(serial), rows);
      void queryClient.invalidateQueries({ queryKey: coreKeys.all });
      void queryClient.invalidateQueries({ queryKey: auditKeys.all });
    },
  });
}
