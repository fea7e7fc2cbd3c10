import http from 'node:http';
import type { HttpRun, Req } from './load.js';
import { summarize } from './stats.js';

/**
 * Requests at a fixed rate, each due at its own time whatever the earlier ones are doing (an open
 * loop, like many tablets working independently), Poisson arrivals as pgbench -R schedules them.
 * Latency counts from when a request was due, so waiting behind a slow server is counted too.
 *
 * Not autocannon: its -R releases each second's quota at once on every connection (the per-second
 * counter in its httpClient.js), so a "25/s" run is a burst of 25 at the top of each second and the
 * latency it reports is mostly that burst queueing. It still drives the flat-out runs.
 */
export async function openLoop(opts: {
  url: string;
  rate: number;
  seconds: number;
  cookie: string;
  next: () => Req;
  /** Sockets the client may open: the tablets on the floor. */
  sockets?: number;
}): Promise<HttpRun> {
  const agent = new http.Agent({ keepAlive: true, maxSockets: opts.sockets ?? 32 });
  const base = new URL(opts.url);
  const latencies: number[] = [];
  const statuses: Record<string, number> = {};
  let ok = 0;
  let errors = 0;
  const inFlight = new Set<Promise<void>>();
  let sent = 0;
  const send = (r: Req, due: number) =>
    new Promise<void>((resolve) => {
      const req = http.request(
        {
          agent,
          host: base.hostname,
          port: base.port,
          method: r.method,
          path: r.path,
          headers: {
            cookie: opts.cookie,
            ...(r.body ? { 'content-type': 'application/json', 'content-length': Buffer.byteLength(r.body) } : {}),
          },
        },
        (res) => {
          res.resume();
          res.on('end', () => {
            const status = res.statusCode ?? 0;
            latencies.push(performance.now() - due);
            statuses[status] = (statuses[status] ?? 0) + 1;
            if (status >= 200 && status < 300) ok += 1;
            else errors += 1;
            resolve();
          });
        },
      );
      req.on('error', () => {
        errors += 1;
        statuses.error = (statuses.error ?? 0) + 1;
        resolve();
      });
      req.end(r.body);
    });

  const start = performance.now();
  const end = start + opts.seconds * 1000;
  let due = start;
  for (;;) {
    due += (-Math.log(1 - Math.random()) / opts.rate) * 1000;
    if (due >= end) break;
    const wait = due - performance.now();
    if (wait > 1) await new Promise((r) => setTimeout(r, wait));
    sent += 1;
    const p = send(opts.next(), due);
    inFlight.add(p);
    void p.then(() => inFlight.delete(p));
  }
  await Promise.all(inFlight);
  agent.destroy();
  return {
    target: opts.rate,
    sent,
    achieved: ok / opts.seconds,
    ok,
    errors,
    latency: summarize(latencies),
    statuses,
  };
}
