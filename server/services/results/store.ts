import type { evaluateForm } from '../../../shared/domain/evaluate.js';
import { describePosition } from '../../../shared/domain/positions.js';
import type { ReadingJson } from '../../../shared/schemas/results.js';
import { StageResult } from '../../models/index.js';
import { claimUploads } from '../attachments.js';
import type { FormChar } from './common.js';
import type { Entered } from './readings.js';
import { usesReentry, type ChosenGauges, type Submission } from './submission.js';

export type Judged = ReturnType<typeof evaluateForm>;

/** What was typed besides the values: where a failure was seen, and values typed in another unit. */
export type Typed = { locations: Map<string, string>; entered: Map<string, Entered> };

/**
 * Stores the result and its readings, each with its verdict and the rule version it was judged
 * to; uses the re-entry and claims the photos. Returns the readings as the reply shows them.
 */
export async function storeResult(
  s: Submission,
  gauges: ChosenGauges,
  judged: Judged,
  sizeClasses: StageResult['sizeClasses'],
  typed: Typed,
) {
  const { ctx, transaction, body } = s;
  const verdict = judged.verdict === 'pass' ? 'pass' : 'fail';
  const reentry = usesReentry(s) ? s.reentry : null;
  const result = await StageResult.create(
    {
      itemId: s.item.id,
      stageId: s.stage.id,
      stationId: s.station.id,
      operatorId: ctx.actor!.id,
      gaugeId: gauges.gauge?.id ?? null,
      startedAt: body.startedAt ? new Date(body.startedAt) : null,
      finishedAt: s.now,
      takenAt: s.takenAt,
      verdict,
      idempotencyKey: body.idempotencyKey,
      supersedesId: s.supersedes?.id ?? null,
      correctionReason: s.correction?.reason ?? null,
      reentryReason: reentry ? reentry.reason : null,
      reentryById: reentry ? reentry.allowedById : null,
      notes: body.notes,
      tabletId: s.tablet?.id ?? null,
      sizeClasses,
    },
    { transaction },
  );
  const charByCode = new Map(s.chars.map((c) => [c.code, c]));
  await insertReadings(s, result.id, gauges, judged, charByCode, typed);
  if (reentry) await reentry.update({ usedByResultId: result.id }, { transaction });
  await claimUploads(ctx, transaction, body.photoIds, 'stage_result', result.id);
  const readings = readingsShown(judged, charByCode, typed);
  return { result, verdict, readings, failing: readings.filter((r) => r.verdict === 'fail'), charByCode } as const;
}

/** One INSERT of plain rows: no model instances built, nothing returned. */
async function insertReadings(
  s: Submission,
  resultId: number,
  { gauge, gaugeOf }: ChosenGauges,
  judged: Judged,
  charByCode: Map<string, FormChar>,
  { locations, entered }: Typed,
) {
  await s.sequelize.getQueryInterface().bulkInsert(
    'readings',
    judged.readings.map((r) => {
      const c = charByCode.get(r.characteristic)!;
      return {
        stage_result_id: resultId,
        characteristic_id: c.id,
        position: r.position,
        value: r.value,
        passed: r.passed,
        location_note: locations.get(`${r.characteristic}@${r.position}`) ?? null,
        unit: c.kind === 'attribute' ? null : c.unit,
        entered_value: entered.get(`${r.characteristic}@${r.position}`)?.value ?? null,
        entered_unit: entered.get(`${r.characteristic}@${r.position}`)?.unit ?? null,
        verdict: r.verdict ?? 'fail',
        tolerance_rule_id: r.ruleId,
        rule_version: r.ruleVersion,
        gauge_id: c.kind === 'variable' ? (gaugeOf.get(c.code)?.id ?? gauge?.id ?? null) : null,
        // created_at: the column's default, the transaction's time (formatting 80 dates here costs more)
      };
    }),
    { transaction: s.transaction },
  );
}

function readingsShown(judged: Judged, charByCode: Map<string, FormChar>, { locations, entered }: Typed) {
  return judged.readings.map((r): ReadingJson => {
    const c = charByCode.get(r.characteristic)!;
    return {
      ...r,
      name: c.name,
      positionLabel: c.positions.find((p) => p.code === r.position)?.label ?? describePosition(r.position),
      unit: c.unit,
      entered: entered.get(`${r.characteristic}@${r.position}`) ?? null,
      kind: c.kind,
      location: locations.get(`${r.characteristic}@${r.position}`) ?? null,
    };
  });
}
