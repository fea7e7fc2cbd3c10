import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Station, UpdateStationBody } from '../../../shared/schemas/reference';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { referenceKeys } from './keys';

export const updateStation = ({ id, ...body }: UpdateStationBody & { id: number }) =>
  http<Station>(`/api/stations/${id}`, { method: 'PATCH', body });

export function useUpdateStation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateStation,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: referenceKeys.stations }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]),
  });
}
