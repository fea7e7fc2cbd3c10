import { randomUUID } from 'node:crypto';
import pg from 'pg';
import { nominalSizeClasses, passingReadings } from '../../db/seeders/sample-readings.js';
import type { TestApp } from './app.js';
import { formFor, gaugesOf, tornDownCore } from './parts.js';

// What the fault drills share: a burst of station submissions from many clients, each behaving as
// the station's queue does (a 503 or a dropped connection is retried with the same idempotency
// key, after Retry-After; anything else is the answer), and the count of what the database kept.

export type Submission = { key: string; serial: string; station: string; body: object };

/**
 * Parts waiting at their first station (block, crankshaft and head of TARN-6 cores), with passing
 * readings; made four cores at a time.
 */
export async function firstStageSubmissions(
  t: TestApp,
  cookies: { receiving: string; operator: string },
  cores: number,
): Promise<Submission[]> {
  const oneCore = async () => {
    const parts = await tornDownCore(t, cookies, 'TARN-6');
    const due = [
      { serial: parts.block, station: 'CLN-1' },
      { serial: parts.crankshaft, station: 'CLN-2' },
      ...parts.heads.map((serial) => ({ serial, station: 'CLN-3' })),
    ];
    const out: Submission[] = [];
    for (const { serial, station } of due) {
      const form = await formFor(t, cookies.operator, station, serial);
      const key = randomUUID();
      out.push({
        key,
        serial,
        station,
        body: {
          idempotencyKey: key,
          serial,
          station,
          ...gaugesOf(form),
          readings: passingReadings(form),
          sizeClasses: nominalSizeClasses(form),
        },
      });
    }
    return out;
  };
  const out: Submission[] = [];
  for (let done = 0; done < cores; done += 4) {
    const batch = await Promise.all(Array.from({ length: Math.min(4, cores - done) }, oneCore));
    out.push(...batch.flat());
  }
  return out;
}

export type Outcome = { status: number | 'gave up'; attempts: number; id: number | null };

export type Burst = {
  outcomes: Outcome[];
  /** Every 5xx reply seen, final or retried, by "status code" (e.g. "503 unavailable"). */
  fiveHundreds: Map<string, number>;
  /** Dropped or refused connections, each retried. */
  networkErrors: number;
  /** The longest wait for one reply or error, in ms. */
  longestMs: number;
};

/**
 * Sends the submissions from `clients` clients at once, each working through its share in turn.
 * `onReply` hears every reply that is not a retry (the drill uses the first to time its fault).
 */
export async function burst(
  base: string,
  cookie: string,
  subs: Submission[],
  { clients = 16, deadline, onReply }: { clients?: number; deadline: number; onReply?: () => void },
): Promise<Burst> {
  const outcomes: Outcome[] = new Array<Outcome>(subs.length);
  const fiveHundreds = new Map<string, number>();
  let networkErrors = 0;
  let longestMs = 0;
  let next = 0;
  const submit = async (s: Submission): Promise<Outcome> => {
    for (let attempt = 1; ; attempt++) {
      let wait = 200;
      const started = Date.now();
      try {
        const res = await fetch(`${base}/api/results`, {
          method: 'POST',
          headers: { 'Content-Type': 'application/json', Cookie: cookie },
          body: JSON.stringify(s.body),
        });
        const body = (await res.json().catch(() => ({}))) as { id?: number; error?: { code?: string } };
        longestMs = Math.max(longestMs, Date.now() - started);
        if (res.status >= 500) {
          const label = `${res.status} ${body.error?.code ?? '?'}`;
          fiveHundreds.set(label, (fiveHundreds.get(label) ?? 0) + 1);
        }
        // the station's rule: only 503 is "try again"; a 500 or any other answer is final
        if (res.status !== 503) {
          onReply?.();
          return { status: res.status, attempts: attempt, id: body.id ?? null };
        }
        wait = Number(res.headers.get('retry-after') ?? 1) * 1000;
      } catch {
        longestMs = Math.max(longestMs, Date.now() - started);
        networkErrors++; // refused or reset: the server is down or restarting
      }
      if (Date.now() + wait > deadline) return { status: 'gave up', attempts: attempt, id: null };
      await new Promise((r) => setTimeout(r, wait));
    }
  };
  await Promise.all(
    Array.from({ length: clients }, async () => {
      while (next < subs.length) {
        const i = next++;
        outcomes[i] = await submit(subs[i]!);
      }
    }),
  );
  return { outcomes, fiveHundreds, networkErrors, longestMs };
}

export type Tally = {
  submissions: number;
  rows: number;
  /** Submissions with no stored result. */
  lost: number;
  /** Submissions stored more than once, and parts with two results at one stage. */
  duplicated: number;
  /** Replies of 201 whose id is not the stored row's. */
  mismatched: number;
};

/** Counts what the database kept for the submissions, and prints one line a person can read. */
export async function tally(url: string, name: string, subs: Submission[], b: Burst): Promise<Tally> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    const keys = subs.map((s) => s.key);
    const rows = await client.query<{ key: string; ids: number[] }>(
      `SELECT idempotency_key AS key, array_agg(id ORDER BY id) AS ids
         FROM stage_results WHERE idempotency_key = ANY($1::uuid[]) GROUP BY 1`,
      [keys],
    );
    const byKey = new Map(rows.rows.map((r) => [r.key, r.ids.map(Number)]));
    const twice = await client.query<{ n: number }>(
      `SELECT count(*)::int AS n FROM (
         SELECT r.item_id, r.stage_id FROM stage_results r JOIN items i ON i.id = r.item_id
          WHERE i.serial = ANY($1::text[]) GROUP BY 1, 2 HAVING count(*) > 1) x`,
      [subs.map((s) => s.serial)],
    );
    const t: Tally = {
      submissions: subs.length,
      rows: [...byKey.values()].reduce((n, ids) => n + ids.length, 0),
      lost: subs.filter((s) => !byKey.has(s.key)).length,
      duplicated: [...byKey.values()].filter((ids) => ids.length > 1).length + twice.rows[0]!.n,
      mismatched: subs.filter((s, i) => b.outcomes[i]!.status === 201 && byKey.get(s.key)?.[0] !== b.outcomes[i]!.id)
        .length,
    };
    const fives = [...b.fiveHundreds].map(([k, n]) => `${k} × ${n}`).join(', ') || 'none';
    process.stdout.write(
      `[drill] ${name}: ${t.submissions} submissions, ${t.rows} rows, ${t.lost} lost, ${t.duplicated} duplicated; ` +
        `5xx: ${fives}; dropped connections: ${b.networkErrors}\n`,
    );
    return t;
  } finally {
    await client.end();
  }
}
