import { existsSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { gzipSync } from 'node:zlib';
import { paths } from '../src/lib/paths.js';

/** The JavaScript a browser fetches to show one route on a cold load. */
export type BundleRow = {
  route: string;
  path: string;
  files: number;
  rawBytes: number;
  gzipBytes: number;
  /**
   * Chunks the route pulls in after its first screen (the camera reader on a tap, the station's
   * part form once a station is chosen), not counted above.
   */
  onDemand?: OnDemandChunks[];
};

export type OnDemandChunks = { module: string; files: number; rawBytes: number; gzipBytes: number };

type ManifestChunk = {
  file: string;
  src?: string;
  isEntry?: boolean;
  isDynamicEntry?: boolean;
  imports?: string[];
  dynamicImports?: string[];
};
type Manifest = Record<string, ManifestChunk>;

const ROOT = fileURLToPath(new URL('..', import.meta.url));

/**
 * The page module behind each main route, as src/router.tsx names it. A module with no chunk of its
 * own in the manifest would be rendered by the entry (router.tsx importing it statically), so the
 * route would cost the entry alone.
 */
const ROUTES: { route: string; path: string; module: string }[] = [
  { route: 'sign-in', path: paths.signIn, module: 'src/routes/sign-in/sign-in-page.tsx' },
  { route: 'home', path: paths.home, module: 'src/routes/home/home-page.tsx' },
  { route: 'station', path: paths.station, module: 'src/routes/station/station-page.tsx' },
  { route: 'intake-log', path: paths.intake, module: 'src/routes/intake/intake-log-page.tsx' },
  { route: 'receive-core', path: paths.receiveCore, module: 'src/routes/intake/receive-page.tsx' },
  { route: 'teardown', path: paths.teardown, module: 'src/routes/teardown/teardown-page.tsx' },
  { route: 'ncr-list', path: paths.ncrs, module: 'src/routes/ncrs/ncr-list-page.tsx' },
  { route: 'build', path: paths.build, module: 'src/routes/build/build-page.tsx' },
  { route: 'trail', path: paths.trail, module: 'src/routes/trail/trail-page.tsx' },
  { route: 'release', path: paths.release, module: 'src/routes/release/release-page.tsx' },
  { route: 'spec-book', path: paths.specBook, module: 'src/routes/spec/spec-book-page.tsx' },
  { route: 'control-charts', path: paths.spc, module: 'src/routes/spc/spc-page.tsx' },
  { route: 'wip-board', path: paths.wip, module: 'src/routes/line/wip-page.tsx' },
  { route: 'yields', path: paths.yields, module: 'src/routes/line/yields-page.tsx' },
];

// Level 9, as for files compressed once at build or deploy time. The server's compression
// middleware runs at zlib's default 6, a few per cent larger.
const GZIP_LEVEL = 9;

/** Per route: entry chunk + the route's chunk + everything they import statically, each file once. */
export async function measureBundles(distDir: string): Promise<BundleRow[]> {
  const manifestPath = path.join(distDir, '.vite', 'manifest.json');
  if (!existsSync(manifestPath)) {
    throw new Error(`${manifestPath} is missing: build the client with build.manifest on (npx vite build)`);
  }
  const manifest = JSON.parse(await readFile(manifestPath, 'utf8')) as Manifest;
  const entries = Object.keys(manifest).filter((k) => manifest[k]!.isEntry);
  if (entries.length !== 1) throw new Error(`expected one entry chunk in ${manifestPath}, found ${entries.length}`);
  const entry = entries[0]!;

  const sizes = new Map<string, { raw: number; gzip: number }>();
  const sizeOf = async (file: string) => {
    let s = sizes.get(file);
    if (!s) {
      const bytes = await readFile(path.join(distDir, file));
      s = { raw: bytes.length, gzip: gzipSync(bytes, { level: GZIP_LEVEL }).length };
      sizes.set(file, s);
    }
    return s;
  };
  const sum = async (keys: Set<string>) => {
    let raw = 0;
    let gzip = 0;
    for (const k of keys) {
      const s = await sizeOf(manifest[k]!.file);
      raw += s.raw;
      gzip += s.gzip;
    }
    return { files: keys.size, rawBytes: raw, gzipBytes: gzip };
  };

  const rows: BundleRow[] = [];
  for (const r of ROUTES) {
    if (!existsSync(path.join(ROOT, r.module))) {
      throw new Error(`${r.module} (route ${r.route}) no longer exists: update ROUTES in bench/client-bundles.ts`);
    }
    const own = manifest[r.module]?.isDynamicEntry ? [r.module] : [];
    const loaded = chunksFrom(manifest, [entry, ...own]);
    const onDemand: OnDemandChunks[] = [];
    for (const d of onDemandOf(manifest, entry, loaded)) onDemand.push({ module: d.module, ...(await sum(d.chunks)) });
    rows.push({ route: r.route, path: r.path, ...(await sum(loaded)), onDemand });
  }
  return rows;
}

/**
 * The chunks reached through static imports, leaving out (and not walking) those a page already
 * has. Lazy imports are chunks of their own, measured one by one.
 */
function chunksFrom(manifest: Manifest, start: string[], loaded?: Set<string>): Set<string> {
  const seen = new Set<string>();
  const walk = (key: string) => {
    if (seen.has(key) || loaded?.has(key)) return;
    const chunk = manifest[key];
    if (!chunk) throw new Error(`the manifest refers to ${key} but has no entry for it`);
    if (!chunk.file.endsWith('.js')) return;
    seen.add(key);
    for (const i of chunk.imports ?? []) walk(i);
  };
  start.forEach(walk);
  return seen;
}

/**
 * Lazy imports the page can trigger without leaving it, and theirs in turn (the camera reader's own
 * library, the station form's re-entry dialog), each with the chunks it adds to what is loaded by
 * then. The entry's lazy imports are the router's pages, which load on navigation: left out.
 */
function onDemandOf(manifest: Manifest, entry: string, loaded: Set<string>): { module: string; chunks: Set<string> }[] {
  const routes = new Set(manifest[entry]!.dynamicImports ?? []);
  const found: { module: string; chunks: Set<string> }[] = [];
  const look = (from: Set<string>, have: Set<string>) => {
    for (const k of from) {
      for (const d of manifest[k]!.dynamicImports ?? []) {
        if (have.has(d) || routes.has(d) || found.some((f) => f.module === d)) continue;
        const chunks = chunksFrom(manifest, [d], have);
        found.push({ module: d, chunks });
        look(chunks, new Set([...have, ...chunks]));
      }
    }
  };
  look(loaded, loaded);
  return found;
}
