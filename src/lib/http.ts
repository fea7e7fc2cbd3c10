import type { ClientErrorCode, ErrorCode } from '../../shared/errors';
import type { ApiError as ApiErrorReply } from '../../shared/schemas/common';

/** The server's reply, or one made here when no reply explains the failure. */
type ErrorBody = Omit<ApiErrorReply['error'], 'code'> & { code: ErrorCode | ClientErrorCode };

/** A failed API call, carrying the server's stable code, its plain message and per-field notes. */
export class ApiError extends Error {
  readonly status: number;
  readonly code: ErrorCode | ClientErrorCode;
  readonly fields: Record<string, string>;
  readonly requestId: string | undefined;
  /** Anything else the server said about the refusal, e.g. `reason` and the look-alike cores of a 409. */
  readonly details: Record<string, unknown>;
  /** Seconds the server asked the client to wait before trying again (Retry-After), if it said. */
  readonly retryAfter: number | null;

  constructor(status: number, body: ErrorBody, retryAfter: number | null = null) {
    super(body.message);
    this.name = 'ApiError';
    this.status = status;
    this.code = body.code;
    this.fields = body.fields ?? {};
    this.requestId = body.requestId;
    const {
      code: _c,
      message: _m,
      fields: _f,
      requestId: _r,
      ...details
    } = body as ErrorBody & Record<string, unknown>;
    this.details = details;
    this.retryAfter = retryAfter;
  }

  /** The session is gone (expired, revoked, password changed elsewhere): not a wrong password. */
  get isSignedOut(): boolean {
    return this.status === 401 && this.code === 'unauthenticated';
  }
}

export type Query = Record<string, string | number | boolean | null | undefined>;

export type RequestOptions = {
  method?: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';
  /** JSON, or FormData for an upload (the browser then sets the multipart boundary itself). */
  body?: unknown;
  query?: Query;
  signal?: AbortSignal;
};

function withQuery(path: string, query: Query | undefined): string {
  if (!query) return path;
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(query)) {
    if (v === undefined || v === null || v === '') continue;
    q.set(k, String(v));
  }
  const s = q.toString();
  return s ? `${path}?${s}` : path;
}

/** Retry-After as seconds: delay-seconds or an HTTP-date (RFC 9110, section 10.2.3). */
function retryAfterOf(res: Response): number | null {
  const raw = res.headers.get('Retry-After')?.trim();
  if (!raw) return null;
  if (/^\d+$/.test(raw)) return Number(raw);
  const at = Date.parse(raw);
  return Number.isNaN(at) ? null : Math.max(0, Math.ceil((at - Date.now()) / 1000));
}

async function readError(res: Response): Promise<ErrorBody> {
  try {
    const json = (await res.json()) as Partial<ApiErrorReply>;
    if (json.error?.message) return json.error;
  } catch {
    // not JSON: a proxy or a crash page; fall through to a plain message
  }
  return {
    code: `http_${res.status}`,
    message: `The server answered ${res.status} ${res.statusText}. Try again shortly.`,
  };
}

/**
 * The one way the client talks to the API: JSON in and out (multipart for uploads), the session
 * cookie sent along, and every failure turned into an ApiError. Sending people to sign-in on a lost session is done once,
 * by the query client (lib/query-client.ts), so this stays free of routing.
 */
export async function http<T>(path: string, { method = 'GET', body, query, signal }: RequestOptions = {}): Promise<T> {
  let res: Response;
  const raw = body === undefined || body instanceof FormData;
  try {
    res = await fetch(withQuery(path, query), {
      method,
      credentials: 'same-origin',
      headers: raw
        ? { Accept: 'application/json' }
        : { Accept: 'application/json', 'Content-Type': 'application/json' },
      body: raw ? (body as FormData | undefined) : JSON.stringify(body),
      signal,
    });
  } catch (err) {
    if (signal?.aborted) throw err;
    throw new ApiError(0, {
      code: 'network',
      message: 'Coretrail could not reach the server. Check the connection, then try again.',
    });
  }
  if (!res.ok) throw new ApiError(res.status, await readError(res), retryAfterOf(res));
  if (res.status === 204) return undefined as T;
  return (await res.json()) as T;
}
