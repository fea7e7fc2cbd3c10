import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { defectCodeBody } from '../../../shared/schemas/ncr';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import type { DefectCode } from './defect-codes';
import { defectCodeKeys } from './keys';

export type CreateDefectCodeBody = z.output<typeof defectCodeBody>;

/** A code already on the list is a 409 `duplicate`, with the note on `code`. */
export const createDefectCode = (body: CreateDefectCodeBody) =>
  http<DefectCode>('/api/defect-codes', { method: 'POST', body });

export function useCreateDefectCode() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createDefectCode,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: defectCodeKeys.all }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]),
  });
}
