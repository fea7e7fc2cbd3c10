import { queryOptions, useQuery } from '@tanstack/react-query';
import type { LotLookupJson } from '../../../shared/schemas/trail';
import { http } from '../../lib/http';
import { trailKeys } from './keys';

/** Lot codes are matched without regard to case, so the cache holds one entry per code. */
export const normalLotCode = (raw: string) => raw.trim().toUpperCase();

export const fetchLot = (lotCode: string, signal?: AbortSignal) =>
  http<LotLookupJson>(`/api/lots/${encodeURIComponent(lotCode)}`, { signal });

export const lotQueryOptions = (raw: string) => {
  const lotCode = normalLotCode(raw);
  return queryOptions({ queryKey: trailKeys.lot(lotCode), queryFn: ({ signal }) => fetchLot(lotCode, signal) });
};

export const useLot = (lotCode: string) => useQuery(lotQueryOptions(lotCode));
