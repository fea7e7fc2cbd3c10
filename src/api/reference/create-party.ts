import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { createPartyBody } from '../../../shared/schemas/reference';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { referenceKeys } from './keys';

export type CreatePartyBody = z.output<typeof createPartyBody>;
export type CreatedParty = { id: number; code: string; name: string; email: string | null };
export type PartyKind = 'customer' | 'supplier';

/** A code already on the list is a 409 with the reason in its message. */
export const createParty = (kind: PartyKind, body: CreatePartyBody) =>
  http<CreatedParty>(kind === 'customer' ? '/api/customers' : '/api/suppliers', { method: 'POST', body });

export function useCreateParty(kind: PartyKind) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreatePartyBody) => createParty(kind, body),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({
          queryKey: kind === 'customer' ? referenceKeys.customers : referenceKeys.suppliers,
        }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]),
  });
}
