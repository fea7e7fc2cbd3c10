import autocannon from 'autocannon';
import { summarize, type Run } from './stats.js';

export type HttpRun = Run & { statuses: Record<string, number> };

export type Req = { method: 'GET' | 'POST'; path: string; body?: string; headers?: Record<string, string> };

/**
 * Drives the API flat out with autocannon: `connections` clients, each sending its next request as
 * soon as the last is answered, no pipelining (fixed rates go through open-loop.ts). Every request comes from `next()`, so each can carry its own serial or key; every
 * latency is kept, so the percentiles are exact.
 */
export async function httpLoad(opts: {
  url: string;
  seconds: number;
  connections: number;
  cookie: string;
  next: () => Req;
}): Promise<HttpRun> {
  const latencies: number[] = [];
  const statuses: Record<string, number> = {};
  let ok = 0;
  let errors = 0;
  const result = await new Promise<autocannon.Result>((resolve, reject) => {
    const instance = autocannon(
      {
        url: opts.url,
        connections: opts.connections,
        pipelining: 1,
        duration: opts.seconds,
        requests: [
          {
            setupRequest: (req) => {
              const r = opts.next();
              return {
                ...req,
                method: r.method,
                path: r.path,
                body: r.body,
                headers: {
                  ...r.headers,
                  cookie: opts.cookie,
                  ...(r.body ? { 'content-type': 'application/json' } : {}),
                },
              };
            },
          },
        ],
      },
      (err, res) => (err ? reject(err) : resolve(res)),
    );
    instance.on('response', (_client, statusCode, _bytes, responseTime) => {
      latencies.push(responseTime);
      statuses[statusCode] = (statuses[statusCode] ?? 0) + 1;
      if (statusCode >= 200 && statusCode < 300) ok += 1;
      else errors += 1;
    });
  });
  errors += result.errors + result.timeouts;
  return {
    target: null,
    sent: ok + errors,
    achieved: ok / opts.seconds,
    ok,
    errors,
    latency: summarize(latencies),
    statuses,
  };
}
