import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { PlantBody, PlantJson } from '../../../shared/schemas/plant';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { plantKeys } from './plant';

export const updatePlant = (body: PlantBody) => http<PlantJson>('/api/plant', { method: 'PATCH', body });

export function useUpdatePlant() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updatePlant,
    onSuccess: (plant) => {
      queryClient.setQueryData(plantKeys.one, plant);
      void queryClient.invalidateQueries({ queryKey: auditKeys.all });
    },
  });
}
