import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ReplacePartBody } from '../../../shared/schemas/build';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { itemKeys } from '../items/keys';
import type { ItemJson } from '../items/types';
import { trailKeys } from '../trail/keys';
import { releaseKeys } from '../release/keys';

/** Takes a part out of a built unit and fits another; a refusal (409 `replace_refused`) says why per field. */
export const replacePart = ({ serial, body }: { serial: string; body: ReplacePartBody }) =>
  http<ItemJson>(`/api/units/${encodeURIComponent(serial)}/replace`, { method: 'POST', body });

export function useReplacePart() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: replacePart,
    onSuccess: async (unit) => {
      queryClient.setQueryData(itemKeys.one(unit.serial), unit);
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: itemKeys.all }),
        queryClient.invalidateQueries({ queryKey: releaseKeys.releaseCheck(unit.serial) }),
        queryClient.invalidateQueries({ queryKey: trailKeys.all }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]);
    },
  });
}
