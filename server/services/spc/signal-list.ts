import { QueryTypes, type Sequelize } from 'sequelize';
import { RUN_RULE_TEXT, type RunRule } from '../../../shared/domain/spc/index.js';
import { CHART_KIND_LABELS, periodBounds, type StoredSignalJson } from '../../../shared/schemas/spc.js';
import { resolveScope } from './scope.js';

/** Signals stored when results were recorded, as the chart's page lists them. */

export type SignalRow = {
  id: number;
  serial: string;
  result_id: number;
  at: Date;
  station: string | null;
  chart: StoredSignalJson['chart'];
  rule: RunRule;
  value: number;
  centre: number;
  lower_limit: number;
  upper_limit: number;
  limits_id: number;
  ncr: string | null;
  held_by: string | null;
  held_at: Date | null;
};

export const SIGNALS_SQL = `SELECT g.id, i.serial, g.stage_result_id AS result_id, g.created_at AS at, st.code AS station, g.chart,
       g.rule, g.value, g.centre, g.lower_limit, g.upper_limit, g.spc_limits_id AS limits_id, n.number AS ncr,
       u.name AS held_by, g.held_at
  FROM spc_signals g
  JOIN spc_limits l ON l.id = g.spc_limits_id
  JOIN items i ON i.id = g.item_id
  JOIN stage_results sr ON sr.id = g.stage_result_id
  LEFT JOIN stations st ON st.id = sr.station_id
  LEFT JOIN nonconformances n ON n.id = g.nonconformance_id
  LEFT JOIN users u ON u.id = g.held_by_id`;

export const presentSignal = (r: SignalRow): StoredSignalJson => ({
  id: r.id,
  serial: r.serial,
  resultId: r.result_id,
  at: new Date(r.at).toISOString(),
  station: r.station,
  chart: r.chart,
  chartLabel: CHART_KIND_LABELS[r.chart],
  rule: r.rule,
  text: RUN_RULE_TEXT[r.rule],
  value: r.value,
  centre: r.centre,
  lower: r.lower_limit,
  upper: r.upper_limit,
  limitsId: r.limits_id,
  ncr: r.ncr,
  heldBy: r.held_by,
  heldAt: r.held_at ? new Date(r.held_at).toISOString() : null,
});

/** Signals raised at stations for a family × characteristic, newest first (at most 500). */
export async function listSignals(
  sequelize: Sequelize,
  q: { family: string; characteristicId: number; from?: string; to?: string },
): Promise<StoredSignalJson[]> {
  const s = await resolveScope(sequelize, q);
  const period = q.from && q.to ? periodBounds(q.from, q.to) : null;
  const rows = await sequelize.query<SignalRow>(
    `${SIGNALS_SQL}
     WHERE l.engine_family_id = :familyId AND l.characteristic_id = :characteristicId
       ${period ? 'AND g.created_at >= :from AND g.created_at < :to' : ''}
     ORDER BY g.id DESC LIMIT 500`,
    {
      type: QueryTypes.SELECT,
      replacements: {
        familyId: s.family.id,
        characteristicId: s.characteristic.id,
        from: period?.from.toISOString(),
        to: period?.to.toISOString(),
      },
    },
  );
  return rows.map(presentSignal);
}
