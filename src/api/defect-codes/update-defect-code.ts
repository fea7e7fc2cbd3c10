import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { updateDefectCodeBody } from '../../../shared/schemas/ncr';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import type { DefectCode } from './defect-codes';
import { defectCodeKeys } from './keys';

export type UpdateDefectCodeBody = z.output<typeof updateDefectCodeBody>;

/** Reword a code, or retire it (`active: false`) and bring it back; codes are never deleted. */
export const updateDefectCode = ({ code, ...body }: UpdateDefectCodeBody & { code: string }) =>
  http<DefectCode>(`/api/defect-codes/${encodeURIComponent(code)}`, { method: 'PATCH', body });

export function useUpdateDefectCode() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateDefectCode,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: defectCodeKeys.all }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]),
  });
}
