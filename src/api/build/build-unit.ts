import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { BuildBody } from '../../../shared/schemas/build';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { itemKeys } from '../items/keys';
import type { ItemJson } from '../items/types';
import { trailKeys } from '../trail/keys';

/** Starts a long block; a refusal (409 `build_refused`) carries one plain message per slot or lot row. */
export const buildUnit = (body: BuildBody) => http<ItemJson>('/api/units', { method: 'POST', body });

export function useBuildUnit() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: buildUnit,
    onSuccess: async (unit) => {
      // every part that went in is now installed, so each part's cached state is out of date
      queryClient.setQueryData(itemKeys.one(unit.serial), unit);
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: itemKeys.all }),
        queryClient.invalidateQueries({ queryKey: trailKeys.all }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]);
    },
  });
}
