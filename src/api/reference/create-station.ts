import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateStationBody, Station } from '../../../shared/schemas/reference';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { referenceKeys } from './keys';

export const createStation = (body: CreateStationBody) => http<Station>('/api/stations', { method: 'POST', body });

export function useCreateStation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createStation,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: referenceKeys.stations }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]),
  });
}
