import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type {
  CharacteristicChangeBody,
  CharacteristicCompareJson,
  CharacteristicDefinition,
  CharacteristicVersionJson,
} from '../../../shared/schemas/characteristic-versions';
import type { approveChangeBody } from '../../../shared/schemas/process';
import { http } from '../../lib/http';
import { auditKeys } from '../audit/keys';
import { referenceKeys } from '../reference/keys';
import { processKeys } from './keys';

export type CharacteristicVersionsJson = { current: CharacteristicDefinition; versions: CharacteristicVersionJson[] };

export const characteristicVersionsQueryOptions = (id: number) =>
  queryOptions({
    queryKey: processKeys.characteristicVersions(id),
    queryFn: ({ signal }) =>
      http<CharacteristicVersionsJson>(`/api/process/characteristics/${id}/versions`, { signal }),
  });
export const useCharacteristicVersions = (id: number) => useQuery(characteristicVersionsQueryOptions(id));

export const characteristicCompareQueryOptions = (a: number, b: number) =>
  queryOptions({
    queryKey: processKeys.characteristicCompare(a, b),
    queryFn: ({ signal }) =>
      http<CharacteristicCompareJson>('/api/process/characteristic-versions/compare', { query: { a, b }, signal }),
  });
export const useCharacteristicCompare = (a: number, b: number) => useQuery(characteristicCompareQueryOptions(a, b));

/** A change to a characteristic touches the process lists, the reference data the floor reads, and the audit log. */
function useChangeMutation<V>(mutationFn: (v: V) => Promise<CharacteristicVersionJson>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: processKeys.all }),
        queryClient.invalidateQueries({ queryKey: referenceKeys.stages }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
      ]),
  });
}

export const useDraftCharacteristicChange = () =>
  useChangeMutation(({ id, ...body }: CharacteristicChangeBody & { id: number }) =>
    http<CharacteristicVersionJson>(`/api/process/characteristics/${id}/versions`, { method: 'POST', body }),
  );
export const useDiscardCharacteristicChange = () =>
  useChangeMutation((id: number) =>
    http<CharacteristicVersionJson>(`/api/process/characteristic-versions/${id}/discard`, { method: 'POST' }),
  );
export const useApproveCharacteristicChange = () =>
  useChangeMutation(({ id, ...body }: z.output<typeof approveChangeBody> & { id: number }) =>
    http<CharacteristicVersionJson>(`/api/process/characteristic-versions/${id}/approve`, { method: 'POST', body }),
  );
