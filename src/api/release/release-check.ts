import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ReleaseCheckJson } from '../../../shared/schemas/release';
import { http } from '../../lib/http';
import { releaseKeys } from './keys';

/** The release gate for a long block; `serial` in its printed form (parseSerial). */
export const fetchReleaseCheck = (serial: string, signal?: AbortSignal) =>
  http<ReleaseCheckJson>(`/api/units/${encodeURIComponent(serial)}/release-check`, { signal });

export const releaseCheckQueryOptions = (serial: string) =>
  queryOptions({
    queryKey: releaseKeys.releaseCheck(serial),
    queryFn: ({ signal }) => fetchReleaseCheck(serial, signal),
  });

export const useReleaseCheck = (serial: string | null) =>
  useQuery({ ...releaseCheckQueryOptions(serial ?? ''), enabled: serial !== null });
