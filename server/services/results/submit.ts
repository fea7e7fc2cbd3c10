import { createHash } from 'node:crypto';
import canonicalize from 'canonicalize';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { evaluateForm } from '../../../shared/domain/evaluate.js';
import { expandPositions } from '../../../shared/domain/positions.js';
import type { ResultJson, SubmitResultBody } from '../../../shared/schemas/results.js';
import type { Ctx } from '../../audit.js';
import { AppError, conflict } from '../../errors.js';
import { IdempotencyKey, User, type StageResult } from '../../models/index.js';
import { checkedSerial, findBySerial } from '../items.js';
import { blockingNcrsOf } from '../ncrs/index.js';
import { requireQualified } from '../qualifications.js';
import { referenceData, VERSION_SQL, versionRead, type Reference, type VersionRow } from '../reference-cache.js';
import { chooseSizeClasses } from '../size-classes.js';
import { formCharacteristics } from '../spec/rules.js';
import { lockUnitsReachedBy } from '../unit-locks.js';
import { routeAfterVerdict } from './after-verdict.js';
import { lower, openReentry, stationByCode } from './common.js';
import { currentResultAt } from './current.js';
import { chooseGauges } from './gauges.js';
import { checkReadings } from './readings.js';
import { auditResult, keepReply, replyOf } from './reply.js';
import { checkSequence } from './sequence.js';
import { storeResult } from './store.js';
import type { Correction, Submission } from './submission.js';
import { tabletTime } from './tablet-time.js';

type Outcome = { status: number; body: ResultJson; replay: boolean };

// the tablet's time is left out: a retry sent a moment later is still the same result
const hashBody = (body: SubmitResultBody) =>
  createHash('sha256')
    .update(canonicalize({ ...body, takenAt: undefined }) ?? '')
    .digest('hex');

/**
 * Records one station result. In one transaction: replay or refuse a used idempotency key, lock the
 * part, check the sequence (or the correction), judge every reading against the rule in force,
 * store the result and readings with verdicts and rule versions, raise an NCR and hold the part on
 * any failure, move it on after a pass, write the audit events, and keep the reply for retries.
 */
export async function submitResult(
  sequelize: Sequelize,
  ctx: Ctx,
  body: SubmitResultBody,
  {
    path = '/api/results',
    correction = null,
    tablet = null,
  }: {
    path?: string;
    correction?: Correction | null;
    /** The shared station tablet the person identified on (badge and PIN), kept with the result. */
    tablet?: { id: number; label: string } | null;
  } = {},
): Promise<Outcome> {
  const requestHash = hashBody(body);
  return sequelize.transaction(async (transaction) => {
    const locked = await replayOrLock(sequelize, ctx, transaction, body, path, requestHash);
    if (locked.replay) return locked.replay;
    const s = await placeOfPart(sequelize, ctx, transaction, body, locked.ref, correction, tablet);
    const gauges = chooseGauges(s.ref, s.chars, body);
    // the size class chosen (a bore's oversize …) sets the limits its readings are judged to
    const sizeClasses = chooseSizeClasses(s.ref, s.chars, body.sizeClasses, measuredIn(body));
    const { entries, ...typed } = checkReadings(s.chars, body);
    const judged = evaluateForm(s.chars, entries);
    const { result, readings, failing, charByCode } = await storeResult(s, gauges, judged, sizeClasses, typed);
    const { before, ncr } = await routeAfterVerdict(s, result, failing, charByCode);
    const reply = await replyOf(s, gauges, result, readings, failing, ncr);
    await keepReply(s, path, requestHash, reply);
    await auditResult(s, gauges, result, judged, ncr, before);
    return { status: 201, body: reply, replay: false };
  });
}

/** The characteristics the body carries a value for. */
const measuredIn = (body: SubmitResultBody) =>
  new Set(body.readings.filter((r) => r.value != null).map((r) => r.characteristic));

/**
 * Two requests with one key take turns here; the second finds the first's stored reply (or is
 * refused when the key was used for something else). The same statement reads the reference
 * data's version (families, stations, routes, rules, gauges).
 */
async function replayOrLock(
  sequelize: Sequelize,
  ctx: Ctx,
  transaction: Transaction,
  body: SubmitResultBody,
  path: string,
  requestHash: string,
): Promise<{ replay: Outcome; ref?: undefined } | { replay?: undefined; ref: Reference }> {
  const [version] = await sequelize.query<VersionRow>(
    `SELECT pg_advisory_xact_lock(hashtextextended(:key, 7241)) AS locked, v.* FROM (${VERSION_SQL}) v`,
    { replacements: { key: body.idempotencyKey }, type: QueryTypes.SELECT, transaction },
  );
  const seen = await IdempotencyKey.findByPk(body.idempotencyKey, { transaction });
  if (seen) {
    if (seen.userId !== ctx.actor!.id || seen.requestHash !== requestHash || seen.path !== path) {
      throw new AppError(
        'idempotency_key_reused',
        'This idempotency key was already used for a different submission. Nothing was recorded; send a new key for a new result.',
      );
    }
    return { replay: { status: seen.statusCode, body: seen.response as ResultJson, replay: true } };
  }
  return { ref: await referenceData(sequelize, transaction, versionRead(version)) };
}

/**
 * The station and stage, the operator's qualification, the part locked, its sequence (or the
 * correction) checked, the time it was taken and the characteristics to record, each with a rule.
 */
async function placeOfPart(
  sequelize: Sequelize,
  ctx: Ctx,
  transaction: Transaction,
  body: SubmitResultBody,
  ref: Reference,
  correction: Correction | null,
  tablet: Submission['tablet'],
): Promise<Submission> {
  const { station, stage } = stationByCode(ref, body.station);
  // a new result needs its operator's qualification for the stage in force today (a correction is
  // a supervisor's or quality's record of what was measured, not a new measurement)
  if (!correction) await requireQualified(sequelize, transaction, ctx.actor!, stage);
  const serial = checkedSerial(body.serial);
  // the units the part reaches first, as the release gate takes them (no NCR slips past a release)
  await lockUnitsReachedBy(sequelize, { serial }, transaction);
  // the part's row lock: a second tablet submitting the same part waits here, then sees the first
  const item = await findBySerial(serial, transaction, { lock: true });
  const family = ref.family(item.engineFamilyId)!;
  const route = ref.routeOfItem(item);
  const holds = await blockingNcrsOf(item.id, stage.id, transaction);
  const reentry = await openReentry(item.id, transaction);
  const place = { sequelize, ctx, transaction, body, ref, station, stage, item, route, reentry, correction, tablet };
  const supersedes = await sequenceOrCorrection(place, holds);
  const now = new Date();
  const takenAt = tabletTime(body, now);
  const chars = formCharacteristics(ref, stage.id, family.id, now, (c) => expandPositions(c.positions, family, item));
  if (!chars.length) throw conflict(`${stage.name} has no characteristics to record yet.`);
  const unruled = chars.filter((c) => c.kind !== 'attribute' && !c.rule);
  if (unruled.length) {
    throw conflict(
      `No approved rule is in force for ${unruled.map((c) => lower(c.name)).join(', ')} on ${family.code}. Quality must approve one before ${stage.name} can be recorded.`,
      { reason: 'no_rule' },
    );
  }
  return { ...place, supersedes, now, takenAt, chars };
}

/**
 * A correction must name the current result at the stage, of a part that can take one; a new
 * result must be due in the part's sequence. A repeat of a result just recorded says so. Returns
 * the result a correction supersedes.
 */
async function sequenceOrCorrection(
  s: Omit<Submission, 'supersedes' | 'now' | 'takenAt' | 'chars'>,
  holds: { number: string }[],
): Promise<StageResult | null> {
  const { transaction, item, stage, correction } = s;
  if (correction) {
    const supersedes = await currentResultAt(item.id, stage.id, transaction);
    if (!supersedes || supersedes.id !== correction.resultId) {
      throw conflict(
        `Result ${correction.resultId} is not the current ${stage.name} result of ${item.serial}: only the current result can be corrected.`,
        { reason: 'not_current' },
      );
    }
    if (item.kind !== stage.partKind || item.status === 'scrapped') {
      throw conflict(`${item.serial} cannot take a correction at ${stage.name}.`);
    }
    return supersedes;
  }
  const check = checkSequence(item, stage, s.route, holds, s.reentry);
  if (!check.ok) {
    const last = await currentResultAt(item.id, stage.id, transaction);
    if (check.code === 'out_of_sequence' && last && Date.now() - last.createdAt.getTime() < 15 * 60_000) {
      const by = await User.findByPk(last.operatorId, { attributes: ['name'], transaction });
      throw conflict(
        `${stage.name} was already recorded for ${item.serial} by ${by?.name ?? 'someone'} at ${last.createdAt.toISOString().slice(11, 16)} UTC (${last.verdict}). Nothing was recorded twice.`,
        { reason: 'already_recorded', resultId: last.id },
      );
    }
    throw conflict(check.message, { reason: check.code, expectedStage: check.expectedStage });
  }
  return null;
}
