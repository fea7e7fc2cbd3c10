import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { summarize, type Run } from './stats.js';

export type SqlRun = Run;

/**
 * Runs pgbench — PostgreSQL's own load driver — with our scripts against the same database: the
 * database alone, with no HTTP, no JSON and no JavaScript. Simple query protocol, as most of the
 * API's statements go out; latencies come from the per-transaction log (-l), so the percentiles
 * are exact. `scripts` maps a file name to its text, optionally with a weight (`name@3`).
 */
export async function pgbench(opts: {
  bin: string;
  url: string;
  scripts: Record<string, string>;
  rate: number | null;
  seconds: number;
  clients: number;
  vars?: Record<string, string | number>;
  /** Seconds run first and not counted: new connections start with cold catalog caches. */
  warmup?: number;
}): Promise<SqlRun> {
  const warmup = opts.warmup ?? 2;
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'coretrail-pgbench-'));
  try {
    const files: string[] = [];
    for (const [name, text] of Object.entries(opts.scripts)) {
      const [file, weight] = name.split('@');
      fs.writeFileSync(path.join(dir, file!), text);
      files.push('-f', weight ? `${file}@${weight}` : file!);
    }
    const args = [
      '-n', // no vacuum of pgbench's own tables: we have none
      '-M',
      'simple',
      '-c',
      String(opts.clients),
      '-j',
      String(Math.min(opts.clients, Math.max(1, os.cpus().length))),
      '-T',
      String(warmup + opts.seconds),
      '-l',
      '--log-prefix=tx',
      ...(opts.rate ? ['-R', String(opts.rate)] : []),
      ...Object.entries(opts.vars ?? {}).flatMap(([k, v]) => ['-D', `${k}=${v}`]),
      ...files,
      opts.url,
    ];
    const countFrom = Date.now() / 1000 + warmup;
    const out = await new Promise<string>((resolve, reject) => {
      const child = spawn(path.join(opts.bin, 'pgbench'), args, { cwd: dir });
      let text = '';
      child.stdout.on('data', (d) => (text += d));
      child.stderr.on('data', (d) => (text += d));
      child.on('error', reject);
      child.on('exit', (code) => (code === 0 ? resolve(text) : reject(new Error(`pgbench exited ${code}:\n${text}`))));
    });
    // each log line: client_id transaction_no time_us script_no epoch epoch_us [schedule_lag_us]; at a
    // fixed rate the lag (due → started) counts too, as the API's open-loop driver counts it
    const latencies: number[] = [];
    for (const f of fs.readdirSync(dir).filter((x) => x.startsWith('tx.'))) {
      for (const line of fs.readFileSync(path.join(dir, f), 'utf8').split('\n')) {
        const cols = line.split(' ');
        if (cols.length < 6 || cols[2] === 'failed' || cols[2] === 'skipped') continue;
        if (Number(cols[4]) + Number(cols[5]) / 1e6 < countFrom) continue; // finished during the warm-up
        latencies.push((Number(cols[2]) + (opts.rate ? Number(cols[6] ?? 0) : 0)) / 1000);
      }
    }
    const failed = /number of failed transactions: (\d+)/.exec(out);
    const skipped = /number of transactions skipped: (\d+)/.exec(out);
    return {
      target: opts.rate,
      achieved: latencies.length / opts.seconds,
      ok: latencies.length,
      sent: latencies.length + (skipped ? Number(skipped[1]) : 0),
      errors: failed ? Number(failed[1]) : 0,
      latency: summarize(latencies),
    };
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

/** A literal for pgbench's simple protocol: quotes doubled, and no `:name` that pgbench would read as a variable. */
export function sqlText(value: unknown): string {
  const s = typeof value === 'string' ? value : JSON.stringify(value);
  return `'${s.replace(/'/g, "''").replace(/:([A-Za-z_])/g, ': $1')}'`;
}
