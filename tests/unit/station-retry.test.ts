import { MutationObserver, QueryClient } from '@tanstack/react-query';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { submission, SUBMIT_RETRIES, type RecordResultBody } from '../../src/api/station/record-result';
import { ApiError } from '../../src/lib/http';

// The station's submission as the tablet runs it: the real fetcher and the real retry policy in a
// TanStack mutation, with the network replaced by a list of answers. What matters to a plant: a
// 503 or a dropped connection is sent again by itself with the very same body and idempotency key
// (so the server can answer a retry with the stored result), after the server's Retry-After; an
// answer about the result itself (400, 409, 422, 500) is shown to the operator at once.

const body: RecordResultBody = {
  idempotencyKey: '8c0d2e0f-4a57-4f2b-9a0e-3f1b0f6b7d11',
  serial: 'B-TEST-1',
  station: 'CLN-1',
  readings: [{ characteristic: 'clean', passed: true }],
};
const stored = { id: 41, serial: 'B-TEST-1', verdict: 'pass' };

type Answer = { status: number; json?: unknown; headers?: Record<string, string> } | 'no connection';
let sent: { at: number; body: string }[];

function network(answers: Answer[]) {
  const fetch = vi.fn(async (_url: string, init: RequestInit) => {
    sent.push({ at: Date.now(), body: String(init.body) });
    const a = answers.shift() ?? 'no connection';
    if (a === 'no connection') throw new TypeError('fetch failed');
    return new Response(JSON.stringify(a.json ?? {}), {
      status: a.status,
      headers: { 'Content-Type': 'application/json', ...a.headers },
    });
  });
  vi.stubGlobal('fetch', fetch);
}

const unavailable = (retryAfter?: string): Answer => ({
  status: 503,
  json: { error: { code: 'unavailable', message: 'The database is not reachable right now. Try again shortly.' } },
  headers: retryAfter ? { 'Retry-After': retryAfter } : {},
});

/** Submits as useRecordResult does and lets the fake clock run until the mutation settles. */
async function submit() {
  const client = new QueryClient();
  const observer = new MutationObserver(client, submission);
  const settled = observer.mutate(body).then(
    (value) => ({ value, error: null }),
    (error: unknown) => ({ value: null, error }),
  );
  await vi.runAllTimersAsync();
  return settled;
}

beforeEach(() => {
  sent = [];
  vi.useFakeTimers({ now: 0 });
});
afterEach(() => {
  vi.useRealTimers();
  vi.unstubAllGlobals();
});

describe('the station sends a result again by itself', () => {
  it('when the server answers 503 with Retry-After: 2, then the same body and key go again 2 s later and the stored result comes back', async () => {
    network([unavailable('2'), { status: 201, json: stored }]);
    const r = await submit();
    expect(r.value).toEqual(stored);
    expect(sent).toHaveLength(2);
    expect(sent[1]!.body).toBe(sent[0]!.body);
    expect(JSON.parse(sent[1]!.body).idempotencyKey).toBe(body.idempotencyKey);
    // RFC 9110 §10.2.3: Retry-After in delay-seconds
    expect(sent[1]!.at - sent[0]!.at).toBe(2000);
  });

  it('when the connection drops, then it tries again after 1 s, 2 s, 4 s with the same key', async () => {
    network(['no connection', 'no connection', 'no connection', { status: 201, json: stored }]);
    const r = await submit();
    expect(r.value).toEqual(stored);
    expect(sent.map((s) => s.at)).toEqual([0, 1000, 3000, 7000]);
    expect(new Set(sent.map((s) => s.body)).size).toBe(1);
  });

  it('when the database stays away, then it stops after the last retry and hands the 503 to the operator', async () => {
    network(Array.from({ length: 10 }, () => unavailable('2')));
    const r = await submit();
    expect(sent).toHaveLength(SUBMIT_RETRIES + 1);
    expect(r.error).toBeInstanceOf(ApiError);
    expect((r.error as ApiError).status).toBe(503);
    expect((r.error as ApiError).retryAfter).toBe(2);
  });

  it.each([
    [400, 'invalid'],
    [409, 'conflict'],
    [422, 'idempotency_key_reused'],
    [500, 'internal'],
  ])('when the server answers %i %s, then nothing is sent again', async (status, code) => {
    network([
      { status, json: { error: { code, message: 'no' } } },
      { status: 201, json: stored },
    ]);
    const r = await submit();
    expect(sent).toHaveLength(1);
    expect((r.error as ApiError).status).toBe(status);
  });
});
