import type { Sequelize } from 'sequelize';
import { paretoQuery, searchQuery, wipQuery, yieldQuery } from '../../shared/schemas/line.js';
import type { Api } from '../http/api.js';
import { freshnessOf, type ReadSide } from '../read-side.js';
import { csvDocument } from '../../shared/csv.js';
import { sendCsv } from '../http/csv.js';
import { alerts, ncrAges, shippingBoard, teardownQueue } from '../services/line/homes.js';
import { search } from '../services/line/search.js';
import { wipBoard } from '../services/line/wip.js';
import { ncrPareto, yieldReport } from '../services/line/yields.js';

const pct = (n: number | null) => (n === null ? '' : (n * 100).toFixed(1));

/**
 * The work-in-process board, search, yields and Pareto read on the read side (a hot standby when one
 * is set) and say how old their data may be. The homes' short lists (teardown queue, NCR ages,
 * alerts, the shipping board, which asks the release gate) are what people act on next: the primary.
 */
export function lineRoutes(api: Api, sequelize: Sequelize, read: ReadSide) {
  const db = read.db;
  api.define({
    method: 'get',
    path: '/line/wip',
    access: 'wip.read',
    summary:
      'Work in process by stage and station (waiting, in work, on hold, with ages), hold ageing and throughput per shift and day; filter by family, part kind, stage or station.',
    query: wipQuery,
    handler: async ({ query }) => ({ ...(await wipBoard(db, query)), readFrom: await freshnessOf(read) }),
  });
  api.define({
    method: 'get',
    path: '/line/teardown-queue',
    access: 'teardown.record',
    summary: 'Cores received and accepted that wait for teardown, oldest first, with their age in days.',
    handler: () => teardownQueue(sequelize),
  });
  api.define({
    method: 'get',
    path: '/line/ncr-ages',
    access: 'ncr.read',
    summary: 'Open NCRs counted by age, and the oldest ones.',
    handler: () => ncrAges(sequelize),
  });
  api.define({
    method: 'get',
    path: '/line/alerts',
    access: 'ncr.read',
    summary: "Open NCRs past the plant's overdue age and parts held longer than its hold threshold.",
    handler: () => alerts(sequelize),
  });
  api.define({
    method: 'get',
    path: '/line/shipping',
    access: 'release.check',
    summary: 'Built units not yet shipped: those the release gate lets go, and those it blocks with its reasons.',
    handler: () => shippingBoard(sequelize),
  });
  api.define({
    method: 'get',
    path: '/search',
    access: 'signed-in',
    summary:
      'One search over partial serials, lot codes, customer references, NCR numbers and casting numbers, grouped by kind (only the kinds the role may open).',
    query: searchQuery,
    handler: async ({ user, query }) => ({
      ...(await search(db, user!.role, query.q)),
      readFrom: await freshnessOf(read),
    }),
  });
  api.define({
    method: 'get',
    path: '/yields',
    access: 'yields.read',
    summary:
      'First-pass yield per stage and station, rolled throughput yield per family, scrap and rework counts, salvage by core source and casting number, over a period.',
    query: yieldQuery,
    handler: async ({ query }) => ({ ...(await yieldReport(db, query)), readFrom: await freshnessOf(read) }),
  });
  api.define({
    method: 'get',
    path: '/yields/export.csv',
    access: 'yields.read',
    summary: 'The first-pass yields per stage and station over the period, as CSV.',
    query: yieldQuery,
    handler: async ({ query, res }) => {
      const y = await yieldReport(db, query);
      const body = csvDocument(
        ['From', 'To', 'Stage', 'Station', 'Entered', 'First pass', 'FPY %'],
        [
          ...y.byStage.map((r) => [
            y.from,
            y.to,
            r.stageCode,
            'all',
            r.entered,
            r.firstPass,
            pct(r.firstPass / r.entered),
          ]),
          ...y.byStation.map((r) => [
            y.from,
            y.to,
            r.stageCode,
            r.station ?? '',
            r.entered,
            r.firstPass,
            pct(r.firstPass / r.entered),
          ]),
        ],
      );
      sendCsv(res, `yields-${query.from}-${query.to}.csv`, body);
      return undefined;
    },
  });
  api.define({
    method: 'get',
    path: '/ncr-pareto',
    access: 'yields.read',
    summary: 'NCRs raised in a period counted by defect code, stage or family, most first, and per week or month.',
    query: paretoQuery,
    handler: async ({ query }) => ({ ...(await ncrPareto(db, query)), readFrom: await freshnessOf(read) }),
  });
  api.define({
    method: 'get',
    path: '/ncr-pareto/export.csv',
    access: 'yields.read',
    summary: 'The NCR Pareto per week or month, as CSV.',
    query: paretoQuery,
    handler: async ({ query, res }) => {
      const p = await ncrPareto(db, query);
      const label = new Map(p.rows.map((r) => [r.key, r.label]));
      const body = csvDocument(
        ['Period', query.by === 'defect' ? 'Defect code' : query.by === 'stage' ? 'Stage' : 'Family', 'Name', 'NCRs'],
        p.periods.map((r) => [r.period, r.key, label.get(r.key) ?? '', r.count]),
      );
      sendCsv(res, `ncr-pareto-${query.by}-${query.from}-${query.to}.csv`, body);
      return undefined;
    },
  });
}
