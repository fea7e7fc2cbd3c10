import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { LabelStock } from '../../lib/paths';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';

export type LabelsPrinted = { printed: { serial: string; reprint: boolean }[] };

export const recordLabelsPrinted = (body: { serials: string[]; stock: LabelStock; reprintReason?: string }) =>
  http<LabelsPrinted>('/api/labels/printed', { method: 'POST', body });

/** Each print is an audit event (a second print of a label is logged as a reprint). */
export function useRecordLabelsPrinted() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: recordLabelsPrinted,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: auditKeys.all }),
  });
}
