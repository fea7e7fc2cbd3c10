import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { submitResultBody } from '../../../shared/schemas/results';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { itemKeys } from '../items/keys';
import { ncrKeys } from '../ncrs/keys';
import { refreshStationForms } from './keys';
import type { ResultJson } from './types';

export type RecordResultBody = z.input<typeof submitResultBody>;

/**
 * The idempotency key travels in the body: a retry with the same key after a dropped connection
 * gets the stored reply back instead of recording the part twice.
 */
export const recordResult = (body: RecordResultBody) => http<ResultJson>('/api/results', { method: 'POST', body });

/**
 * A result moves the part on (or holds it): its forms, its item view with its results history
 * (kept under the item's key) and the audit trail change; a failure also adds an NCR to the lists.
 */
export function useRecordResult() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: recordResult,
    onSuccess: (result) =>
      Promise.all([
        refreshStationForms(queryClient),
        queryClient.invalidateQueries({ queryKey: itemKeys.one(result.serial) }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
        result.nonconformance ? queryClient.invalidateQueries({ queryKey: ncrKeys.lists }) : null,
      ]),
  });
}
