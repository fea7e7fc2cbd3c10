import { queryOptions, useQuery } from '@tanstack/react-query';
import type { FieldActionJson } from '../../../shared/schemas/field-actions';
import { http } from '../../lib/http';
import { fieldActionKeys } from './keys';

export const fetchFieldAction = (number: string, signal?: AbortSignal) =>
  http<FieldActionJson>(`/api/field-actions/${encodeURIComponent(number)}`, { signal });

export const fieldActionQueryOptions = (number: string) =>
  queryOptions({ queryKey: fieldActionKeys.one(number), queryFn: ({ signal }) => fetchFieldAction(number, signal) });

export const useFieldAction = (number: string) => useQuery(fieldActionQueryOptions(number));
