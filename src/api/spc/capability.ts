import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { SpcCapabilityJson } from '../../../shared/schemas/spc';
import { http } from '../../lib/http';
import { spcKeys, type SpcCapabilityQueryInput } from './keys';

export const fetchSpcCapability = (q: SpcCapabilityQueryInput, signal?: AbortSignal) =>
  http<SpcCapabilityJson>('/api/spc/capability', { query: q, signal });

export const spcCapabilityQueryOptions = (q: SpcCapabilityQueryInput) =>
  queryOptions({ queryKey: spcKeys.capability(q), queryFn: ({ signal }) => fetchSpcCapability(q, signal) });

export const useSpcCapability = (q: SpcCapabilityQueryInput | null) =>
  useQuery({
    ...spcCapabilityQueryOptions(q ?? { family: '', characteristicId: 0, from: '', to: '' }),
    enabled: q !== null,
    placeholderData: keepPreviousData,
  });
