// `npm run bench` (through scripts/bench.mjs, which starts a throwaway cluster): seeds a plant's
// history, then measures the API beside PostgreSQL alone, and the client. Prints one table and
// writes the figures as JSON under .bench/.
import { execFileSync, spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { gaugesFor } from '../db/seeders/demo-parts.js';
import { passingReadings } from '../db/seeders/sample-readings.js';
import type { StationFormJson } from '../shared/schemas/results.js';
import { measureBundles, measureScanToForm } from './client.js';
import { historyFaker, loadTemplates, prepareTemplates, seedTimes, writeCopies, type Template } from './history.js';
import { measureLots, measureNcrList, measureTrail, measureWritePath, type Ctx } from './measure.js';
import { prepareDatabase } from './prep.js';
import { printReport } from './report.js';
import { startApi } from './server.js';
import { measureSpc } from './spc.js';
import { measureLine } from './line.js';
import { measureBlast } from './blast.js';
import { profileWritePath } from './write-profile.js';
import { createSequelize } from '../server/db.js';
import { countYieldDays } from '../server/services/line/yield-days.js';

async function countAllYieldDays(dbUrl: string) {
  const sequelize = createSequelize(dbUrl, { poolMax: 1 });
  try {
    // the history was loaded with triggers off (session_replication_role), so the days the API
    // counted at its start were not forgotten as its back-dated results would have them: forget them
    await sequelize.query('DELETE FROM yield_days_done');
    let days = 0;
    for (let c = await countYieldDays(sequelize); c.days; c = await countYieldDays(sequelize)) days += c.days;
    return days;
  } finally {
    await sequelize.close();
  }
}

const url = process.env.DATABASE_URL!;
const pgBin = process.env.PG_BIN!;
const UNITS = Number(process.env.BENCH_UNITS ?? 50_000);
const SECONDS = Number(process.env.BENCH_SECONDS ?? 10);
const WRITE_RATES = (process.env.BENCH_WRITE_RATES ?? '10,20,30,40,50,60').split(',').map(Number);
const READ_RATE = Number(process.env.BENCH_READ_RATE ?? 20);
const SPC_RATE = Number(process.env.BENCH_SPC_RATE ?? 2);
const LINE_RATE = Number(process.env.BENCH_LINE_RATE ?? 5);
const BLAST_RATE = Number(process.env.BENCH_BLAST_RATE ?? 2);
const STATION = 'BH-1';
const POOL_BASE = 10_000_000; // copy numbers of parts waiting at the station, apart from shipped units
const BATCH = 2_500;
const started = Date.now();
const log = (s: string) =>
  process.stderr.write(`[bench ${((Date.now() - started) / 1000).toFixed(0).padStart(3)} s] ${s}\n`);

const machine = {
  cpus: os.cpus().length,
  cpuModel: os.cpus()[0]?.model ?? 'unknown',
  memoryGiB: Number((os.totalmem() / 2 ** 30).toFixed(1)),
  node: process.version,
  platform: `${os.type()} ${os.release()}`,
  settings: JSON.parse(process.env.BENCH_PG_SETTINGS ?? '{}') as Record<string, string>,
};

// the client is built into a folder of the benchmark's own; BENCH_REUSE_DIST=1 keeps the last one
const DIST = path.resolve('.bench', 'dist');
const build = new Promise<void>((resolve, reject) => {
  if (process.env.BENCH_REUSE_DIST === '1' && fs.existsSync(path.join(DIST, 'index.html'))) return resolve();
  const child = spawn('npx', ['vite', 'build', '--logLevel', 'warn', '--outDir', DIST, '--emptyOutDir'], {
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  child.on('exit', (code) => (code === 0 ? resolve() : reject(new Error(`vite build exited ${code}`))));
});
build.catch(() => undefined);

log('migrating and seeding the demo plant through the services…');
await prepareDatabase(url);
const db = new pg.Pool({ connectionString: url, max: 4 });
await db.query('CREATE EXTENSION IF NOT EXISTS pg_stat_statements');
const templates = await loadTemplates(db);
if (templates.length < 2) throw new Error(`expected a shipped unit of each family, found ${templates.length}`);
await prepareTemplates(db, templates);
const serials = new Set((await db.query<{ serial: string }>('SELECT serial FROM items')).rows.map((r) => r.serial));
const customers = (await db.query<{ id: number }>('SELECT id FROM customers ORDER BY id')).rows.map((r) => r.id);
const boreHone = (await db.query<{ id: number }>("SELECT id FROM stages WHERE code = 'bore-hone'")).rows[0]!.id;
const faker = historyFaker();
const corrie = templates.find((t) => t.familyCode === 'CORRIE-8') ?? templates[0]!;
const YEARS = 5;

/** Units k ∈ [from, to], shipped evenly over the last five years, oldest first. */
async function seedUnits(from: number, to: number) {
  for (let a = from; a <= to; a += BATCH) {
    const b = Math.min(to, a + BATCH - 1);
    const copies = [];
    for (let k = a; k <= b; k++) {
      const t: Template = templates[k % templates.length]!;
      const shipAt = new Date(Date.now() - (1 - k / UNITS) * YEARS * 365 * 86_400_000 - 86_400_000);
      copies.push({ k, template: t, shipAt, customerId: customers[k % customers.length]!, pool: false });
    }
    await writeCopies(db, copies, { serials, faker, boreHoneStageId: boreHone });
    log(`  units ${b.toLocaleString('en')} / ${UNITS.toLocaleString('en')}`);
  }
  await db.query(
    `INSERT INTO bench_units (k, serial) SELECT m.k, m.serial FROM bench_item_map m JOIN bench_copy c USING (k)
      WHERE m.old_id = c.unit_id AND NOT c.pool AND m.k BETWEEN $1 AND $2`,
    [from, to],
  );
  await db.query(
    `INSERT INTO bench_lot_codes (k, lot_code) SELECT row_number() OVER (ORDER BY pl.id) + (SELECT count(*) FROM bench_lot_codes), pl.lot_code
       FROM part_lots pl WHERE pl.id IN (SELECT new_id FROM bench_lot_map) AND pl.lot_code NOT IN (SELECT lot_code FROM bench_lot_codes)`,
  );
}

/**
 * Blocks waiting at bore and hone (one in twenty on hold with an open NCR instead). They reached
 * the line over the last two weeks, as a queue builds, not all today: each copy's history ends on
 * one of the last 14 days.
 */
async function seedPool(count: number) {
  const copies = Array.from({ length: count }, (_, i) => ({
    k: POOL_BASE + i + 1,
    template: corrie,
    shipAt: new Date(Date.now() - (i % 14) * 86_400_000),
    customerId: customers[0]!,
    pool: true,
  }));
  for (let i = 0; i < copies.length; i += BATCH) {
    await writeCopies(db, copies.slice(i, i + BATCH), { serials, faker, boreHoneStageId: boreHone });
  }
}

/**
 * After a bulk load, what a plant's database looks like after autovacuum has caught up: visibility
 * map and statistics current, dirty buffers written — so no vacuum or checkpoint runs mid-measure.
 * The operating system's own dirty pages are flushed too, so their write-back does not compete with
 * the first reads measured after the load.
 */
async function settle() {
  await db.query('VACUUM (ANALYZE)');
  await db.query('CHECKPOINT');
  execFileSync('sync');
}

const counts = async () =>
  (
    await db.query<Record<string, string>>(
      `SELECT (SELECT count(*) FROM items WHERE kind = 'long_block' AND status = 'shipped') AS shipped_units,
              (SELECT count(*) FROM items) AS items, (SELECT count(*) FROM stage_results) AS results,
              (SELECT count(*) FROM readings) AS readings, (SELECT count(*) FROM nonconformances) AS ncrs,
              (SELECT count(*) FROM part_lots) AS lots, pg_size_pretty(pg_database_size(current_database())) AS size`,
    )
  ).rows[0]!;

await db.query(`CREATE UNLOGGED TABLE bench_units (k int PRIMARY KEY, serial varchar(24) NOT NULL);
  CREATE UNLOGGED TABLE bench_lot_codes (k int PRIMARY KEY, lot_code varchar(60) NOT NULL);
  CREATE UNLOGGED TABLE bench_raw_parts (slot int PRIMARY KEY, item_id int NOT NULL, serial varchar(24) NOT NULL);
  CREATE SEQUENCE bench_raw_seq;`);

// enough parts for every step, the flat-out run (well under 150/s here) and the probes
// (flat out twice: once measured, once under the CPU profiler)
const apiPoolSize = Math.ceil(WRITE_RATES.reduce((a, b) => a + b, 0) * SECONDS * 1.15 + 2 * 150 * SECONDS + 500);
const rawPoolSize = 2_000;
const seeding: { phase: string; seconds: number; counts: Record<string, string> }[] = [];
let t = Date.now();
const tenth = Math.round(UNITS / 10);
log(
  `seeding ${tenth.toLocaleString('en')} shipped units (10 %) and ${(apiPoolSize + rawPoolSize).toLocaleString('en')} parts waiting at ${STATION}…`,
);
await seedUnits(1, tenth);
await seedPool(apiPoolSize + rawPoolSize);
await settle();
seeding.push({ phase: '10 %', seconds: (Date.now() - t) / 1000, counts: await counts() });

// the parts waiting at the station: most for the API, a few thousand (reused in turn) for pgbench
const waiting = (
  await db.query<{ id: number; serial: string }>(
    `SELECT i.id, i.serial FROM bench_item_map m JOIN items i ON i.id = m.new_id
      WHERE m.k > $1 AND i.kind = 'block' AND i.status = 'in_process' ORDER BY m.k`,
    [POOL_BASE],
  )
).rows;
const rawParts = waiting.slice(-rawPoolSize);
const apiParts = waiting.slice(0, -rawPoolSize);
const scanParts = apiParts.splice(-12);
await db.query('INSERT INTO bench_raw_parts SELECT * FROM unnest($1::int[], $2::int[], $3::varchar[])', [
  rawParts.map((_, i) => i),
  rawParts.map((p) => p.id),
  rawParts.map((p) => p.serial),
]);

if (process.env.BENCH_SEED_ONLY === '1') {
  // for looking into the seeded plant (with BENCH_KEEP=1): the whole history, nothing measured
  await seedUnits(tenth + 1, UNITS);
  await settle();
  log(`seeded only: ${JSON.stringify(await counts())}`);
  await db.end();
  process.exit(0);
}

await build;
const server = await startApi(url, DIST);
try {
  const c: Ctx = {
    api: server.url,
    db,
    url,
    pgBin,
    seconds: SECONDS,
    cookies: {
      operator: await server.signIn('operator'),
      warranty: await server.signIn('warranty'),
      quality: await server.signIn('quality'),
    },
    log,
  };
  const trail10 = await measureTrail(c, READ_RATE);

  t = Date.now();
  log(`seeding the other ${(UNITS - tenth).toLocaleString('en')} shipped units…`);
  await seedUnits(tenth + 1, UNITS);
  await settle();
  if (process.env.BENCH_DEBUG === '1') {
    for (const [k, v] of [...seedTimes].sort((a, b) => b[1] - a[1]).slice(0, 15)) log(`  ${v.toFixed(1)} s  ${k}`);
  }
  seeding.push({ phase: '100 %', seconds: (Date.now() - t) / 1000, counts: await counts() });
  // the history was written with earlier times, so its plant days are not counted for the yield
  // report yet: count them as the API's job would over its next runs
  t = Date.now();
  const yieldDays = await countAllYieldDays(url);
  log(
    `counted ${yieldDays.toLocaleString('en')} plant days for the yield report in ${((Date.now() - t) / 1000).toFixed(1)} s`,
  );
  const yieldCount = { days: yieldDays, seconds: (Date.now() - t) / 1000 };

  const trail100 = await measureTrail(c, READ_RATE);
  const lots = await measureLots(c, READ_RATE);
  const ncrs = await measureNcrList(c, READ_RATE);
  const spc = await measureSpc(c, SPC_RATE);
  const line = await measureLine(c, LINE_RATE);
  const blast = await measureBlast(c, BLAST_RATE);

  const form = (await (
    await fetch(`${server.url}/api/stations/${STATION}/form?serial=${apiParts[0]!.serial}`, {
      headers: { cookie: c.cookies.operator },
    })
  ).json()) as StationFormJson;
  const { gauge, gauges } = gaugesFor(form);
  const write = await measureWritePath(c, {
    station: STATION,
    rates: WRITE_RATES,
    serials: apiParts.map((p) => p.serial),
    form,
    readings: passingReadings(form),
    gauge,
    gauges,
  });

  log('client: JavaScript per route, and scan-to-form in Chromium…');
  const bundles = await measureBundles(DIST);
  const scan = await measureScanToForm({
    baseUrl: server.url,
    email: 'operator@larkspur.example',
    password: 'operator-coretrail-demo',
    station: STATION,
    serials: scanParts.map((p) => p.serial),
    chromiumPath: process.env.CHROMIUM_PATH,
  });

  log('write path flat out once more, the API under the CPU profiler…');
  const writeProfile = await profileWritePath(
    c,
    DIST,
    { station: STATION, serials: apiParts.map((p) => p.serial), form, readings: passingReadings(form), gauge, gauges },
    write.partsUsed,
  );

  const figures = {
    at: new Date().toISOString(),
    machine,
    units: UNITS,
    seconds: SECONDS,
    seeding,
    yieldCount,
    trail: { tenth: trail10, full: trail100 },
    lots,
    ncrs,
    spc,
    line,
    blast,
    write,
    writeProfile,
    client: { bundles, scan },
    wallSeconds: (Date.now() - started) / 1000,
  };
  fs.mkdirSync('.bench', { recursive: true });
  const file = path.join('.bench', `bench-${figures.at.replace(/[:.]/g, '-')}.json`);
  fs.writeFileSync(file, JSON.stringify(figures, null, 2));
  fs.copyFileSync(file, path.join('.bench', 'latest.json'));
  printReport(figures);
  log(`figures written to ${file}`);
} finally {
  await server.stop();
  await db.end();
}
