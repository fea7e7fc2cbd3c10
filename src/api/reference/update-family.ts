import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { EngineFamily, FamilyBody } from '../../../shared/schemas/reference';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { referenceKeys } from './keys';

export const updateFamily = ({ id, body }: { id: number; body: FamilyBody }) =>
  http<EngineFamily>(`/api/engine-families/${id}`, { method: 'PUT', body });

export function useUpdateFamily() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateFamily,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: referenceKeys.families }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]),
  });
}
