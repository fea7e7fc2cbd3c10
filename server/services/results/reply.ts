import type { ReadingJson, ResultJson } from '../../../shared/schemas/results.js';
import { recordAudit } from '../../audit.js';
import { Attachment, IdempotencyKey, Stage, StageResult, User } from '../../models/index.js';
import { presentAttachment } from '../attachments.js';
import type { ItemPlace, RaisedNcr } from './after-verdict.js';
import type { Judged } from './store.js';
import type { ChosenGauges, Submission } from './submission.js';

/** The reply to the tablet: the result, its readings, any NCR, and where the part goes next. */
export async function replyOf(
  s: Submission,
  { gauge }: ChosenGauges,
  result: StageResult,
  readings: ReadingJson[],
  failing: ReadingJson[],
  ncr: RaisedNcr | null,
): Promise<ResultJson> {
  const { ctx, transaction, item, stage, station } = s;
  // the next stage is on the route already read; the operator's name came with the session
  const nextStage = item.currentStageId
    ? (s.route?.steps.find((x) => x.stageId === item.currentStageId)?.stage ??
      (await Stage.findByPk(item.currentStageId, { transaction })))
    : null;
  const operatorName =
    ctx.actor!.name ?? (await User.findByPk(ctx.actor!.id, { attributes: ['name'], transaction }))?.name ?? '';
  const photos = s.body.photoIds.length
    ? (await Attachment.findAll({ where: { entity: 'stage_result', entityId: String(result.id) }, transaction })).map(
        presentAttachment,
      )
    : [];
  return {
    id: result.id,
    serial: item.serial,
    stage: { code: stage.code, name: stage.name },
    station: { code: station.code, name: station.name },
    operator: operatorName,
    gauge: gauge?.code ?? null,
    verdict: result.verdict,
    finishedAt: s.now.toISOString(),
    takenAt: s.takenAt.toISOString(),
    notes: result.notes,
    readings,
    sizeClasses: result.sizeClasses,
    failing,
    nonconformance: ncr ? { number: ncr.number, severity: ncr.severity } : null,
    supersedes: s.supersedes?.id ?? null,
    correctionReason: result.correctionReason,
    reentryReason: result.reentryReason,
    photos,
    item: {
      status: item.status,
      currentStage: nextStage ? { code: nextStage.code, name: nextStage.name } : null,
    },
  };
}

/** Keeps the reply under the idempotency key, for a retry to find. */
export async function keepReply(s: Submission, path: string, requestHash: string, reply: ResultJson) {
  await IdempotencyKey.create(
    {
      key: s.body.idempotencyKey,
      userId: s.ctx.actor!.id,
      method: 'POST',
      path,
      requestHash,
      statusCode: 201,
      response: reply,
    },
    { transaction: s.transaction, returning: false },
  );
}

/**
 * The result's event, then the item's when it moved. Last: the first event takes the audit chain's
 * lock, which every writer waits for until this transaction commits, so a pass holds it for these
 * inserts alone (a failure's NCR took it earlier).
 */
export async function auditResult(
  s: Submission,
  { gauge, gaugeOf }: ChosenGauges,
  result: StageResult,
  judged: Judged,
  ncr: RaisedNcr | null,
  before: ItemPlace,
) {
  const { ctx, transaction, item, supersedes, tablet } = s;
  await recordAudit(ctx, transaction, {
    action: supersedes ? 'result.corrected' : 'result.recorded',
    entity: 'stage_result',
    entityId: result.id,
    before: supersedes ? { resultId: supersedes.id, verdict: supersedes.verdict } : undefined,
    after: {
      item: item.serial,
      stage: s.stage.code,
      station: s.station.code,
      gauge: gauge?.code ?? null,
      gauges: Object.fromEntries([...gaugeOf].map(([c, g]) => [c, g.code])),
      verdict: result.verdict,
      takenAt: s.takenAt.toISOString(),
      idempotencyKey: s.body.idempotencyKey,
      correctionReason: s.correction?.reason ?? null,
      reentryReason: result.reentryReason,
      readings: judged.readings.map((r) => [
        r.characteristic,
        r.position,
        r.value ?? r.passed,
        r.verdict,
        r.ruleVersion,
      ]),
      nonconformance: ncr?.number ?? null,
      ...(tablet ? { tablet: { id: tablet.id, label: tablet.label } } : {}),
    },
  });
  if (before.status !== item.status || before.currentStage !== item.currentStageId) {
    await recordAudit(ctx, transaction, {
      action: result.verdict === 'fail' ? 'item.held' : 'item.moved',
      entity: 'item',
      entityId: item.serial,
      before,
      after: { status: item.status, currentStage: item.currentStageId, byResult: result.id },
    });
  }
}
