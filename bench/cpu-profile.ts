import fs from 'node:fs';
import path from 'node:path';

/**
 * Where a Node process spent its CPU, from a V8 `.cpuprofile` (what `node --cpu-prof` writes): self
 * time per sample summed by where the code comes from — a package from node_modules, a folder of
 * ours, Node's own modules, the garbage collector — so "the API is slower than PostgreSQL alone"
 * can be read as "this much is the driver, this much the ORM, this much our own code".
 */

type ProfileNode = {
  id: number;
  callFrame: { functionName: string; url: string; lineNumber: number };
  hitCount?: number;
};
type CpuProfile = { nodes: ProfileNode[]; samples: number[]; timeDeltas: number[]; startTime: number; endTime: number };

export type CpuShare = { where: string; ms: number; share: number };
export type CpuSummary = {
  /** wall time the profile covers, ms */
  wallMs: number;
  /** time not idle, ms */
  busyMs: number;
  byOrigin: CpuShare[];
  topFunctions: { fn: string; ms: number; share: number }[];
};

export function originOf(url: string, functionName: string): string {
  if (!url) {
    if (functionName === '(garbage collector)') return 'garbage collector';
    if (functionName === '(idle)') return 'idle';
    return 'V8 and native code';
  }
  const nm = url.lastIndexOf('/node_modules/');
  if (nm >= 0) {
    const rest = url.slice(nm + '/node_modules/'.length).split('/');
    return rest[0]!.startsWith('@') ? `${rest[0]}/${rest[1]}` : rest[0]!;
  }
  if (url.startsWith('node:')) return 'Node.js core';
  const m = /\/(server|shared|db)\/(.*)$/.exec(url);
  if (m) {
    const parts = m[2]!.split('/');
    return `coretrail ${m[1]}/${parts.length > 1 ? `${parts[0]}/` : parts[0]!.replace(/\.[jt]s$/, '')}`;
  }
  return 'other';
}

/**
 * `lastUs`: only the samples of the profile's last so many microseconds (the load, not the
 * process's start, whose module loading would otherwise dominate).
 */
export function summarizeProfile(profile: CpuProfile, top = 12, lastUs = Infinity): CpuSummary {
  const byId = new Map(profile.nodes.map((n) => [n.id, n]));
  const self = new Map<number, number>();
  // timeDeltas[i] is the time from the sample before to sample i: it belongs to sample i's frame
  const at: number[] = [];
  profile.timeDeltas.reduce((t, d, i) => (at[i] = t + d), profile.startTime);
  const from = profile.endTime - lastUs;
  profile.samples.forEach((id, i) => {
    if (at[i]! >= from) self.set(id, (self.get(id) ?? 0) + (profile.timeDeltas[i] ?? 0));
  });
  const origins = new Map<string, number>();
  const fns = new Map<string, number>();
  let wall = 0;
  for (const [id, us] of self) {
    const n = byId.get(id)!;
    const origin = originOf(n.callFrame.url, n.callFrame.functionName);
    origins.set(origin, (origins.get(origin) ?? 0) + us);
    wall += us;
    if (origin === 'idle') continue;
    const file = n.callFrame.url ? path.basename(n.callFrame.url) : '';
    const fn =
      `${n.callFrame.functionName || '(anonymous)'} ${file ? `${origin === file ? '' : `${origin} `}${file}:${n.callFrame.lineNumber + 1}` : ''}`.trim();
    fns.set(fn, (fns.get(fn) ?? 0) + us);
  }
  const busy = wall - (origins.get('idle') ?? 0);
  const share = (us: number) => Math.round((1000 * us) / Math.max(1, busy)) / 10;
  return {
    wallMs: Math.round(wall / 1000),
    busyMs: Math.round(busy / 1000),
    byOrigin: [...origins]
      .filter(([o]) => o !== 'idle')
      .sort((a, b) => b[1] - a[1])
      .map(([where, us]) => ({ where, ms: Math.round(us / 1000), share: share(us) })),
    topFunctions: [...fns]
      .sort((a, b) => b[1] - a[1])
      .slice(0, top)
      .map(([fn, us]) => ({ fn, ms: Math.round(us / 1000), share: share(us) })),
  };
}

/**
 * The main thread's profile in `dir`, summarized (its last `lastUs` microseconds). Node writes one
 * file per thread at exit, all in the same second (CPU.<date>.<time>.<pid>.<thread>.<seq>): the
 * main thread is thread 0; a loader's worker thread writes a small file of its own beside it.
 */
export function summarizeNewestProfile(dir: string, lastUs = Infinity): CpuSummary {
  const thread = (f: string) => Number(/\.(\d+)\.\d+\.cpuprofile$/.exec(f)?.[1] ?? 0);
  const files = fs
    .readdirSync(dir)
    .filter((f) => f.endsWith('.cpuprofile'))
    .sort(
      (a, b) =>
        thread(a) - thread(b) || fs.statSync(path.join(dir, b)).mtimeMs - fs.statSync(path.join(dir, a)).mtimeMs,
    )
    .map((f) => path.join(dir, f));
  if (!files.length) throw new Error(`no .cpuprofile in ${dir}`);
  return summarizeProfile(JSON.parse(fs.readFileSync(files[0]!, 'utf8')) as CpuProfile, 12, lastUs);
}
