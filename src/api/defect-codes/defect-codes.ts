import { queryOptions, useQuery } from '@tanstack/react-query';
import type { DefectCodeJson } from '../../../shared/schemas/ncr';
import { http } from '../../lib/http';
import { defectCodeKeys } from './keys';

export type DefectCode = DefectCodeJson;

/** The plant's defect codes, active and retired, in code order. */
export const fetchDefectCodes = (signal?: AbortSignal) => http<DefectCode[]>('/api/defect-codes', { signal });

export const defectCodesQueryOptions = () =>
  queryOptions({ queryKey: defectCodeKeys.all, queryFn: ({ signal }) => fetchDefectCodes(signal) });

export const useDefectCodes = () => useQuery(defectCodesQueryOptions());
