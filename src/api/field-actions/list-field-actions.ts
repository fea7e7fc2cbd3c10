import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Paged } from '../../../shared/schemas/common';
import type { FieldActionJson, FieldActionState } from '../../../shared/schemas/field-actions';
import { http } from '../../lib/http';
import { fieldActionKeys } from './keys';

export const fetchFieldActions = (state: FieldActionState | undefined, page: number, signal?: AbortSignal) =>
  http<Paged<FieldActionJson>>('/api/field-actions', { query: { state, page, pageSize: 50 }, signal });

export const fieldActionsQueryOptions = (state: FieldActionState | undefined, page = 1) =>
  queryOptions({
    queryKey: fieldActionKeys.list(state, page),
    queryFn: ({ signal }) => fetchFieldActions(state, page, signal),
  });

export const useFieldActions = (state: FieldActionState | undefined, page = 1, enabled = true) =>
  useQuery({ ...fieldActionsQueryOptions(state, page), placeholderData: keepPreviousData, enabled });
