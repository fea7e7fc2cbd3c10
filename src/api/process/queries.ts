import { queryOptions, useQuery } from '@tanstack/react-query';
import type {
  CastingNumberJson,
  CharacteristicJson,
  PartKindJson,
  ProcessStageJson,
  RouteStepJson,
  RouteVersionJson,
} from '../../../shared/schemas/process';
import { http } from '../../lib/http';
import { processKeys } from './keys';

export const partKindsQueryOptions = () =>
  queryOptions({
    queryKey: processKeys.partKinds,
    queryFn: ({ signal }) => http<PartKindJson[]>('/api/process/part-kinds', { signal }),
  });
export const usePartKinds = () => useQuery(partKindsQueryOptions());

export const processStagesQueryOptions = () =>
  queryOptions({
    queryKey: processKeys.stages,
    queryFn: ({ signal }) => http<ProcessStageJson[]>('/api/process/stages', { signal }),
  });
export const useProcessStages = () => useQuery(processStagesQueryOptions());

export const characteristicsQueryOptions = (stage: string | null) =>
  queryOptions({
    queryKey: processKeys.characteristics(stage),
    queryFn: ({ signal }) =>
      http<CharacteristicJson[]>(`/api/process/characteristics${stage ? `?stage=${encodeURIComponent(stage)}` : ''}`, {
        signal,
      }),
  });
export const useCharacteristics = (stage: string | null) => useQuery(characteristicsQueryOptions(stage));

export const routeVersionsQueryOptions = (family: string) =>
  queryOptions({
    queryKey: processKeys.routes(family),
    queryFn: ({ signal }) =>
      http<RouteVersionJson[]>(`/api/process/routes?family=${encodeURIComponent(family)}`, { signal }),
    enabled: !!family,
  });
export const useRouteVersions = (family: string) => useQuery(routeVersionsQueryOptions(family));

export type RouteComparison = {
  left: RouteVersionJson;
  right: RouteVersionJson;
  rows: {
    stage: string;
    left: RouteStepJson | null;
    right: RouteStepJson | null;
    change: 'same' | 'added' | 'removed' | 'moved' | 'changed';
  }[];
};
export const compareQueryOptions = (a: number, b: number) =>
  queryOptions({
    queryKey: processKeys.compare(a, b),
    queryFn: ({ signal }) => http<RouteComparison>(`/api/process/routes/compare?a=${a}&b=${b}`, { signal }),
  });
export const useRouteComparison = (a: number, b: number) => useQuery(compareQueryOptions(a, b));

export const castingNumbersQueryOptions = (family: string) =>
  queryOptions({
    queryKey: processKeys.castingNumbers(family),
    queryFn: ({ signal }) =>
      http<CastingNumberJson[]>(`/api/process/families/${encodeURIComponent(family)}/casting-numbers`, { signal }),
    enabled: !!family,
  });
export const useCastingNumbers = (family: string) => useQuery(castingNumbersQueryOptions(family));
