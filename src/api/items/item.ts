import { queryOptions, useQuery } from '@tanstack/react-query';
import { http } from '../../lib/http';
import { itemKeys } from './keys';
import type { ItemJson } from './types';

/** `serial` is the checked, printed form (parseSerial), so one item has one cache entry however it was typed. */
export const fetchItem = (serial: string, signal?: AbortSignal) =>
  http<ItemJson>(`/api/items/${encodeURIComponent(serial)}`, { signal });

export const itemQueryOptions = (serial: string) =>
  queryOptions({ queryKey: itemKeys.one(serial), queryFn: ({ signal }) => fetchItem(serial, signal) });

export const useItem = (serial: string | null) =>
  useQuery({ ...itemQueryOptions(serial ?? ''), enabled: serial !== null });
