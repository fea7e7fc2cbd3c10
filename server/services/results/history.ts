import { QueryTypes, type Sequelize } from 'sequelize';
import type { ReadingJson, ResultJson } from '../../../shared/schemas/results.js';
import { StageResult } from '../../models/index.js';
import { findBySerial } from '../items.js';
import { loadResultRecords } from '../result-records.js';

/** An item's results, newest first, each with its readings, in a fixed number of queries. */
export async function resultsOf(serial: string): Promise<(ResultJson & { supersededBy: number | null })[]> {
  const item = await findBySerial(serial);
  const results = await StageResult.findAll({
    where: { itemId: item.id },
    order: [
      ['finishedAt', 'DESC'],
      ['id', 'DESC'],
    ],
  });
  if (!results.length) return [];
  const ids = results.map((r) => r.id);
  const [records, ncrs] = await Promise.all([
    loadResultRecords(results, [item]),
    (StageResult.sequelize as Sequelize).query<{ stage_result_id: number; number: string; severity: string }>(
      'SELECT stage_result_id, number, severity FROM nonconformances WHERE stage_result_id IN (:ids)',
      { type: QueryTypes.SELECT, replacements: { ids } },
    ),
  ]);
  const ncrByResult = new Map(ncrs.map((n) => [n.stage_result_id, n]));
  return results.map((r) => {
    const rs: ReadingJson[] = records.readings(r).map((x) => ({ ...x, rounded: null, reason: '' }));
    const stage = records.stage(r);
    const station = records.station(r);
    const ncr = ncrByResult.get(r.id);
    return {
      id: r.id,
      serial: item.serial,
      stage: { code: stage.code, name: stage.name },
      station: station ? { code: station.code, name: station.name } : null,
      operator: records.name(r.operatorId),
      gauge: records.gauge(r),
      verdict: r.verdict,
      finishedAt: r.finishedAt.toISOString(),
      takenAt: r.takenAt?.toISOString() ?? null,
      notes: r.notes,
      readings: rs,
      sizeClasses: r.sizeClasses ?? {},
      failing: rs.filter((x) => x.verdict === 'fail'),
      nonconformance: ncr ? { number: ncr.number, severity: ncr.severity } : null,
      supersedes: r.supersedesId,
      supersededBy: records.supersededBy(r),
      correctionReason: r.correctionReason,
      reentryReason: r.reentryReason,
      photos: records.photos(r),
      item: { status: item.status, currentStage: null },
    };
  });
}
