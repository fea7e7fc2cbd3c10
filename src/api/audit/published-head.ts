import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SignedHeadJson } from '../../../shared/schemas/audit';
import { http } from '../../lib/http';
import { auditKeys } from './keys';

export type PublishedHead = { key: { keyId: string; publicKey: string } | null; head: SignedHeadJson | null };

/** The plant's public key and latest signed head: public, for the verify page. */
export const fetchPublishedHead = (signal?: AbortSignal) => http<PublishedHead>('/api/audit/log/head', { signal });

export const publishedHeadQueryOptions = () =>
  queryOptions({
    queryKey: auditKeys.publishedHead,
    queryFn: ({ signal }) => fetchPublishedHead(signal),
    staleTime: 0,
  });

export function usePublishedHead() {
  return useQuery(publishedHeadQueryOptions());
}

/** RFC 9162 consistency proof between two sizes of the plant's log (public). */
export const fetchConsistency = (from: number, to: number) =>
  http<{ from: number; to: number; proof: string[] }>('/api/audit/log/consistency', { query: { from, to } });
