import { PLANT } from '../db/seeders/plant.js';
import { BOARD_SQL, STAGES_SQL, THROUGHPUT_SQL, boardValues } from '../server/services/line/wip.js';
import { LIVE_FROM_SQL, LOSSES_SQL, SALVAGE_SQL, YIELD_SQL, paretoSql } from '../server/services/line/yields.js';
import { readBoth, type Ctx, type Side } from './measure.js';
import { sqlText } from './pgbench.js';

/**
 * The line's reads at a plant's size: the work-in-process board, a year's yield report and a year's
 * NCR Pareto, each beside PostgreSQL alone running the API's own statements
 * (server/services/line/) with the same values.
 */

/** A statement with its `:name` replacements written in as literals, for pgbench. */
export function inline(sql: string, replacements: Record<string, unknown>): string {
  return `${sql.replace(/(?<!:):([A-Za-z]+)\b/g, (m, name: string) => {
    if (!(name in replacements)) return m;
    const v = replacements[name];
    if (v === null || v === undefined) return 'NULL';
    return typeof v === 'number' ? String(v) : sqlText(v);
  })};\n`;
}

export type LineFigures = { wip: Side; yields: Side; pareto: Side; from: string; to: string };

export async function measureLine(c: Ctx, rate: number): Promise<LineFigures> {
  const to = new Date().toISOString().slice(0, 10);
  const from = new Date(Date.now() - 364 * 86_400_000).toISOString().slice(0, 10);
  const tz = PLANT.timeZone;
  const none = boardValues({});
  c.log(`line: WIP board, yields and NCR Pareto from ${from} to ${to}, ${rate}/s`);

  const wip = await readBoth(
    c,
    rate,
    { cookie: c.cookies.quality, path: () => '/api/line/wip' },
    {
      scripts: {
        'wip.sql': [inline(BOARD_SQL, none), inline(STAGES_SQL, none), inline(THROUGHPUT_SQL, { ...none, tz })].join(
          '',
        ),
      },
    },
  );
  const period = { from, to, tz, family: null };
  const {
    rows: [live],
  } = await c.db.query<{ live_from: string }>(inline(LIVE_FROM_SQL, period));
  const liveFrom = live!.live_from;
  c.log(`yields: counted days up to ${liveFrom}, judged live from then on`);
  const yields = await readBoth(
    c,
    rate,
    { cookie: c.cookies.quality, path: () => `/api/yields?from=${from}&to=${to}` },
    {
      scripts: {
        // as the API: the first day judged live, then the report with that day as a value
        'yields.sql': [
          inline(LIVE_FROM_SQL, period),
          ...[YIELD_SQL, LOSSES_SQL, SALVAGE_SQL].map((s) => inline(s, { ...period, liveFrom })),
        ].join(''),
      },
    },
  );
  const pareto = await readBoth(
    c,
    rate,
    { cookie: c.cookies.quality, path: () => `/api/ncr-pareto?from=${from}&to=${to}&by=defect&grain=month` },
    { scripts: { 'pareto.sql': inline(paretoSql('defect'), { ...period, grain: 'month' }) } },
  );
  return { wip, yields, pareto, from, to };
}
