import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { submitResultBody } from '../../../shared/schemas/results';
import { ApiError, http } from '../../lib/http';
import { inTabletMode, setTabletIdentity, tabletIdentity } from '../../lib/tablet-mode';
import { auditKeys } from '../audit/keys';
import { itemKeys } from '../items/keys';
import { ncrKeys } from '../ncrs/keys';
import { refreshStationForms } from './keys';
import type { ResultJson } from './types';

export type RecordResultBody = z.input<typeof submitResultBody>;

/**
 * The idempotency key travels in the body: a retry with the same key after a dropped connection
 * gets the stored reply back instead of recording the part twice.
 */
export const recordResult = (body: RecordResultBody) => {
  if (!inTabletMode()) return http<ResultJson>('/api/results', { method: 'POST', body });
  // a shared tablet: the person who took the readings names themselves with badge and PIN
  const who = tabletIdentity();
  if (!who) {
    return Promise.reject(
      new ApiError(400, {
        code: 'identify_first',
        message: 'Scan your badge and enter your PIN (at the top) before recording. Nothing was recorded.',
      }),
    );
  }
  return http<ResultJson>('/api/tablet/results', { method: 'POST', body: { ...body, ...who } }).catch(
    (err: unknown) => {
      // a badge and PIN refused (or a badge told to wait) are asked for again, not sent again
      if (err instanceof ApiError && (err.code === 'pin_refused' || err.code === 'too_many')) setTabletIdentity(null);
      throw err;
    },
  );
};

/** Retries after the first try, before the operator is asked to press Record result again. */
export const SUBMIT_RETRIES = 5;

/**
 * Which failures the station sends again by itself: a 503 (the database is away for a moment, or
 * the server is restarting) and no answer at all. The body goes again unchanged, idempotency key
 * included, so a result that did reach the database comes back as it was stored, never twice.
 * Anything else is an answer about the result itself and goes to the operator.
 */
export function retrySubmission(failuresSoFar: number, err: unknown): boolean {
  // with no network at all the result waits on the tablet instead (lib/offline-queue.ts)
  if (err instanceof ApiError && err.status === 0 && typeof navigator !== 'undefined' && !navigator.onLine)
    return false;
  return err instanceof ApiError && (err.status === 503 || err.status === 0) && failuresSoFar < SUBMIT_RETRIES;
}

/** The server's Retry-After when it gave one; else 1 s, 2 s, 4 s … up to 15 s. */
export function submissionRetryDelay(failuresSoFar: number, err: unknown): number {
  if (err instanceof ApiError && err.retryAfter !== null) return Math.min(err.retryAfter, 60) * 1000;
  return Math.min(1000 * 2 ** failuresSoFar, 15_000);
}

/** How the station sends a result: the fetcher and its retry policy (the hook adds the cache updates). */
export const submission = { mutationFn: recordResult, retry: retrySubmission, retryDelay: submissionRetryDelay };

/**
 * A result moves the part on (or holds it): its forms, its item view with its results history
 * (kept under the item's key) and the audit trail change; a failure also adds an NCR to the lists.
 */
export function useRecordResult() {
  const queryClient = useQueryClient();
  return useMutation({
    ...submission,
    onSuccess: (result) =>
      Promise.all([
        refreshStationForms(queryClient),
        queryClient.invalidateQueries({ queryKey: itemKeys.one(result.serial) }),
        queryClient.invalidateQueries({ queryKey: auditKeys.all }),
        result.nonconformance ? queryClient.invalidateQueries({ queryKey: ncrKeys.lists }) : null,
      ]),
  });
}
