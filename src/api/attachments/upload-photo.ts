import { useMutation, useQueryClient } from '@tanstack/react-query';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';

import type { AttachmentJson } from '../../../shared/schemas/attachments';

export type Attachment = AttachmentJson;

export function uploadPhoto(file: File) {
  const form = new FormData();
  form.append('file', file);
  return http<Attachment>('/api/attachments', { method: 'POST', body: form });
}

/** The photo waits, private to the uploader, until the record it belongs to is saved with its id. */
export function useUploadPhoto() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: uploadPhoto,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: auditKeys.all }),
  });
}
