import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CreditRevisionJson } from '../../../shared/schemas/warranty';
import { http } from '../../lib/http';
import { warrantyKeys } from './keys';

export const creditUrl = (serial: string) => `/api/cores/${encodeURIComponent(serial)}/credit-revisions`;

export const fetchCreditRevisions = (serial: string, signal?: AbortSignal) =>
  http<CreditRevisionJson[]>(creditUrl(serial), { signal });

export const creditRevisionsQueryOptions = (serial: string) =>
  queryOptions({
    queryKey: warrantyKeys.credit(serial),
    queryFn: ({ signal }) => fetchCreditRevisions(serial, signal),
  });

export const useCreditRevisions = (serial: string) => useQuery(creditRevisionsQueryOptions(serial));
