import { rehearseRule, type StoredReading } from '../shared/domain/spc/index.js';
import type { RuleJson } from '../shared/schemas/spec.js';
import {
  partReadingsSql,
  rehearsalReadingsSql,
  rehearsalColumns,
  rehearsalRow,
  type RehearsalDocument,
  SHIPPED_UNITS_SQL,
  type ReadingFilter,
} from '../server/services/spc/readings.js';
import { openLoop } from './open-loop.js';
import { pgbench, sqlText } from './pgbench.js';
import { readBoth, type Ctx, type Side } from './measure.js';

/**
 * SPC at a plant's size: the control chart of the V8's cylinder bore over the last year, and the
 * rehearsal of a tighter draft of that rule over the same year, each beside PostgreSQL alone
 * running the API's own statements (server/services/spc/readings.ts) with the same values.
 */

const CLIENTS = 10;
const WARMUP_SECONDS = 2;

/** A statement with its `:name` replacements written in as literals, for pgbench. */
function inline(sql: string, replacements: Record<string, unknown>): string {
  return sql.replace(/(?<!:):([A-Za-z]+)\b/g, (m, name: string) => {
    if (!(name in replacements)) return m;
    const v = replacements[name];
    if (Array.isArray(v)) return v.length ? v.map(Number).join(', ') : 'NULL';
    return typeof v === 'number' ? String(v) : sqlText(v);
  });
}

export type SpcFigures = {
  chart: Side;
  rehearsal: Side;
  parts: number;
  readings: number;
  flips: number;
  shipped: number;
};

export async function measureSpc(c: Ctx, rate: number): Promise<SpcFigures> {
  const { rows } = await c.db.query<{ family: number; bore: number }>(
    `SELECT f.id AS family, ch.id AS bore FROM engine_families f, characteristics ch JOIN stages s ON s.id = ch.stage_id
      WHERE f.code = 'CORRIE-8' AND s.code = 'bore-hone' AND ch.code = 'bore'`,
  );
  const { family, bore } = rows[0]!;
  const to = new Date();
  const from = new Date(to.getTime() - 365 * 86_400_000);
  const filter: ReadingFilter = { familyId: family, characteristicId: bore, from, to };
  const chartPath = `/api/spc/chart?family=CORRIE-8&characteristicId=${bore}&from=${from.toISOString()}&to=${to.toISOString()}`;
  const probe = (await (await fetch(`${c.api}${chartPath}`, { headers: { cookie: c.cookies.quality } })).json()) as {
    points: unknown[];
    readings: number;
  };
  c.log(`SPC chart: CORRIE-8 bore over a year, ${probe.points.length} parts, ${probe.readings} readings, ${rate}/s`);
  const chartSql = partReadingsSql(filter);
  const chart = await readBoth(
    c,
    rate,
    { cookie: c.cookies.quality, path: () => chartPath },
    { scripts: { 'spc-chart.sql': `${inline(chartSql.sql, chartSql.replacements)};\n` } },
  );

  // a tighter draft of the V8 bore (±0.0003 in instead of ±0.0005), rehearsed over the same year
  const draftRes = await fetch(`${c.api}/api/spec/rules`, {
    method: 'POST',
    headers: { cookie: c.cookies.quality, 'content-type': 'application/json' },
    body: JSON.stringify({
      family: 'CORRIE-8',
      characteristicId: bore,
      limits: { limitType: 'nominal', nominal: 4.03, minusTol: 0.0003, plusTol: 0.0003, resolution: 0.0001 },
    }),
  });
  const draft = (await draftRes.json()) as RuleJson;
  if (draftRes.status !== 201) throw new Error(`draft refused: ${JSON.stringify(draft)}`);
  // PostgreSQL alone runs what the API sends: the readings, then the shipped units of the parts that flip
  const readSql = rehearsalReadingsSql(filter);
  const {
    rows: [first],
  } = await c.db.query<{ doc: RehearsalDocument }>(inline(readSql.sql, readSql.replacements));
  const parts = rehearsalColumns(first!.doc);
  const stored: StoredReading[] = parts
    .map(rehearsalRow)
    .flatMap(({ itemId, readings }) =>
      readings.map(([position, value, verdict]) => ({ partId: String(itemId), position, value, verdict })),
    );
  const r = rehearseRule({ readings: stored, rule: { ...draft, limitType: 'nominal' }, resolution: 0.0001 });
  const flipped = r.parts.filter((p) => p.flip === 'pass-to-fail').map((p) => Number(p.partId));
  const shippedSql = flipped.length ? inline(SHIPPED_UNITS_SQL, { ids: flipped }) : 'SELECT 1';
  const { rows: shipped } = await c.db.query(shippedSql);
  c.log(
    `rule rehearsal: ${parts.length} parts, ${stored.length} readings; ${flipped.length} would fail, in ${shipped.length} shipped units; ${rate}/s`,
  );
  const body = JSON.stringify({ from: from.toISOString(), to: to.toISOString() });
  const http = (seconds: number) =>
    openLoop({
      url: c.api,
      rate,
      seconds,
      cookie: c.cookies.quality,
      next: () => ({ method: 'POST', path: `/api/spec/rules/${draft.id}/rehearsals`, body }),
    });
  await http(WARMUP_SECONDS);
  const api = await http(c.seconds);
  const raw = await pgbench({
    bin: c.pgBin,
    url: c.url,
    scripts: { 'spc-rehearsal.sql': `${inline(readSql.sql, readSql.replacements)};\n${shippedSql};\n` },
    rate,
    seconds: c.seconds,
    clients: CLIENTS,
  });
  c.log(
    `  API ${api.achieved.toFixed(1)}/s p95 ${api.latency.p95.toFixed(1)} ms; PostgreSQL alone ${raw.achieved.toFixed(1)}/s p95 ${raw.latency.p95.toFixed(1)} ms`,
  );
  await fetch(`${c.api}/api/spec/rules/${draft.id}/discard`, {
    method: 'POST',
    headers: { cookie: c.cookies.quality },
  });
  return {
    chart,
    rehearsal: { api, raw },
    parts: probe.points.length,
    readings: probe.readings,
    flips: flipped.length,
    shipped: shipped.length,
  };
}
