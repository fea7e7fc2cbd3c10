import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Paged } from '../../../shared/schemas/common';
import type { TaskJson } from '../../../shared/schemas/corrective-action';
import { http } from '../../lib/http';
import { caKeys } from './keys';

export const fetchActions = (owner: 'me' | 'anyone', overdue: boolean | undefined, signal?: AbortSignal) =>
  http<Paged<TaskJson>>('/api/corrective-actions/actions', {
    query: { owner, overdue: overdue === undefined ? undefined : String(overdue), pageSize: 50 },
    signal,
  });

export const actionsQueryOptions = (owner: 'me' | 'anyone', overdue?: boolean) =>
  queryOptions({
    queryKey: caKeys.actions(owner, overdue),
    queryFn: ({ signal }) => fetchActions(owner, overdue, signal),
  });

export const useActions = (owner: 'me' | 'anyone', overdue?: boolean, enabled = true) =>
  useQuery({ ...actionsQueryOptions(owner, overdue), enabled });
