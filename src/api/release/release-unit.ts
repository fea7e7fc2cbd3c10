import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ReleaseBody, ReleaseCheckJson, ShipmentJson } from '../../../shared/schemas/release';
import { ApiError, http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { itemKeys } from '../items/keys';
import { trailKeys } from '../trail/keys';
import { releaseKeys } from './keys';

export type ReleaseReply = { check: ReleaseCheckJson; shipment: ShipmentJson };

export const releaseUnit = ({ serial, body }: { serial: string; body: ReleaseBody }) =>
  http<ReleaseReply>(`/api/units/${encodeURIComponent(serial)}/release`, { method: 'POST', body });

export function useReleaseUnit() {
  const queryClient = useQueryClient();
  const refresh = (serial: string) =>
    Promise.all([
      queryClient.invalidateQueries({ queryKey: releaseKeys.releaseCheck(serial) }),
      queryClient.invalidateQueries({ queryKey: releaseKeys.documents(serial) }),
      queryClient.invalidateQueries({ queryKey: itemKeys.one(serial) }),
      queryClient.invalidateQueries({ queryKey: trailKeys.all }),
      queryClient.invalidateQueries({ queryKey: auditKeys.all }),
    ]);
  return useMutation({
    mutationFn: releaseUnit,
    onSuccess: (_reply, { serial }) => refresh(serial),
    // something changed since the gate was read (an NCR raised meanwhile): read it again
    onError: (err, { serial }) => {
      if (err instanceof ApiError && err.code === 'not_releasable') void refresh(serial);
    },
  });
}
