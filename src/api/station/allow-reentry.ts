import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { reentryBody } from '../../../shared/schemas/results';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import type { ItemJson } from '../items/types';
import { itemKeys } from '../items/keys';
import { refreshStationForms } from './keys';

export type ReentryBody = z.input<typeof reentryBody>;

export const allowReentry = ({ serial, body }: { serial: string; body: ReentryBody }) =>
  http<ItemJson>(`/api/items/${encodeURIComponent(serial)}/reentry`, { method: 'POST', body });

/** A supervisor sends a part back through a stage; every station form for it is asked again. */
export function useAllowReentry() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: allowReentry,
    onSuccess: (item) => {
      queryClient.setQueryData(itemKeys.one(item.serial), item);
      return Promise.all([
        refreshStationForms(queryClient),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]);
    },
  });
}
