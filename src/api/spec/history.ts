import { queryOptions, useQuery } from '@tanstack/react-query';
import type { RuleHistoryJson } from '../../../shared/schemas/spec';
import { http } from '../../lib/http';
import { specKeys } from './keys';

export const fetchRuleHistory = (family: string, characteristicId: number, signal?: AbortSignal) =>
  http<RuleHistoryJson>('/api/spec/history', { query: { family, characteristicId }, signal });

export const ruleHistoryQueryOptions = (family: string, characteristicId: number) =>
  queryOptions({
    queryKey: specKeys.history(family, characteristicId),
    queryFn: ({ signal }) => fetchRuleHistory(family, characteristicId, signal),
  });

export const useRuleHistory = (family: string, characteristicId: number) =>
  useQuery(ruleHistoryQueryOptions(family, characteristicId));
