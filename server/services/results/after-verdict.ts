import { nextStep } from '../../../shared/domain/route.js';
import type { ReadingJson } from '../../../shared/schemas/results.js';
import type { StageResult } from '../../models/index.js';
import { moveItemQuietly } from '../item-moves.js';
import { raiseNonconformance, settleRework, type FailingReading } from '../ncrs/index.js';
import { checkControlLimits } from '../spc/signal-check.js';
import { lower, type FormChar } from './common.js';
import type { Submission } from './submission.js';

export type RaisedNcr = Awaited<ReturnType<typeof raiseNonconformance>>;

/** Where the item stood before the result moved it. */
export type ItemPlace = { status: string; currentStage: number | null };

/**
 * Where the part goes after the verdict: a failure raises an NCR and holds the part at the stage;
 * a pass (not a correction) moves it to its next stage, or finishes it. The result's own event and
 * the item's event after it carry the new place, so the moves here are quiet. Then any rework the
 * stage settles, and the control-chart check (a signal may hold the part too).
 */
export async function routeAfterVerdict(
  s: Submission,
  result: StageResult,
  failing: ReadingJson[],
  charByCode: Map<string, FormChar>,
): Promise<{ before: ItemPlace; ncr: RaisedNcr | null }> {
  const { sequelize, ctx, transaction, item, stage } = s;
  const before: ItemPlace = { status: item.status, currentStage: item.currentStageId };
  let ncr: RaisedNcr | null = null;
  if (result.verdict === 'fail') {
    ncr = await raiseForFailure(s, result, failing, charByCode, before.status);
    await moveItemQuietly(transaction, item, { status: 'on_hold', currentStageId: stage.id });
  } else if (!s.supersedes) {
    const next = nextStep(s.route?.steps ?? [], stage.id);
    await moveItemQuietly(
      transaction,
      item,
      next ? { status: 'in_process', currentStageId: next.stageId } : { status: 'finished', currentStageId: null },
    );
  }
  if (!s.supersedes) await settleRework(ctx, transaction, item, stage.id, result, ncr, stage.name);
  // a run-rule signal against frozen control limits mails quality and may hold the part
  await checkControlLimits(sequelize, ctx, transaction, {
    ref: s.ref,
    item,
    stage,
    station: s.station,
    resultId: result.id,
  });
  return { before, ncr };
}

/** The NCR a failing result raises, with a snapshot of its failing readings. */
async function raiseForFailure(
  s: Submission,
  result: StageResult,
  failing: ReadingJson[],
  charByCode: Map<string, FormChar>,
  statusBefore: string,
) {
  const { item, stage, station } = s;
  const critical = failing.some((r) => charByCode.get(r.characteristic)!.critical);
  // each characteristic carries its own defect code: a critical failure's comes first
  const first =
    failing.map((r) => charByCode.get(r.characteristic)!).find((c) => c.critical) ??
    charByCode.get(failing[0]!.characteristic)!;
  const shown = failing.slice(0, 4).map((r) => `${r.name} at ${lower(r.positionLabel)}: ${r.reason}`);
  const snapshot: FailingReading[] = failing.map((r) => ({
    characteristic: r.characteristic,
    name: r.name,
    position: r.position,
    positionLabel: r.positionLabel,
    value: r.value,
    passed: r.passed,
    unit: r.unit,
    lower: r.lower,
    upper: r.upper,
    reason: r.reason,
    ruleVersion: r.ruleVersion,
    location: r.location,
  }));
  return raiseNonconformance(s.sequelize, s.ctx, s.transaction, {
    itemId: item.id,
    itemSerial: item.serial,
    itemStatusBefore: statusBefore,
    stageId: stage.id,
    stageResultId: result.id,
    severity: critical ? 'critical' : 'major',
    defectCode: first.defectCode,
    description: `${stage.name} failed on ${item.serial}: ${shown.join('; ')}${failing.length > 4 ? `; and ${failing.length - 4} more` : ''}.`,
    failing: snapshot,
    origin: `Raised by the failing ${stage.name} result recorded at ${station.name}`,
  });
}
