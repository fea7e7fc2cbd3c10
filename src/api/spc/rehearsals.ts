import { queryOptions, useQuery } from '@tanstack/react-query';
import type { RehearsalJson } from '../../../shared/schemas/spc';
import { http } from '../../lib/http';
import { spcKeys } from './keys';

export const fetchRehearsals = (ruleId: number, signal?: AbortSignal) =>
  http<RehearsalJson[]>(`/api/spec/rules/${ruleId}/rehearsals`, { signal });

export const rehearsalsQueryOptions = (ruleId: number) =>
  queryOptions({ queryKey: spcKeys.rehearsals(ruleId), queryFn: ({ signal }) => fetchRehearsals(ruleId, signal) });

export const useRehearsals = (ruleId: number | null) =>
  useQuery({ ...rehearsalsQueryOptions(ruleId ?? 0), enabled: ruleId !== null });
