import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { EngineFamily, FamilyBody } from '../../../shared/schemas/reference';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { referenceKeys } from './keys';

export const createFamily = (body: FamilyBody) => http<EngineFamily>('/api/engine-families', { method: 'POST', body });

export function useCreateFamily() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createFamily,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: referenceKeys.families }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]),
  });
}
