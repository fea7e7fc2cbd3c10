import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SpecBookJson } from '../../../shared/schemas/spec';
import { http } from '../../lib/http';
import { specKeys } from './keys';

export const fetchSpecBook = (family: string, signal?: AbortSignal) =>
  http<SpecBookJson>('/api/spec/book', { query: { family }, signal });

export const specBookQueryOptions = (family: string) =>
  queryOptions({ queryKey: specKeys.book(family), queryFn: ({ signal }) => fetchSpecBook(family, signal) });

export const useSpecBook = (family: string | null) =>
  useQuery({ ...specBookQueryOptions(family ?? ''), enabled: family !== null });
