import { createHash } from 'node:crypto';
import canonicalize from 'canonicalize';
import { Op, QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { evaluateForm, physicallyPossible, type Entries } from '../../shared/domain/evaluate.js';
import { describePosition, expandPositions } from '../../shared/domain/positions.js';
import type {
  ReadingJson,
  ResultJson,
  SequenceCheck,
  StationFormJson,
  SubmitResultBody,
} from '../../shared/schemas/results.js';
import { PART_KIND_LABELS } from '../../shared/schemas/reference.js';
import { convertDecimal, unitOf } from '../../shared/domain/units.js';
import { recordAudit, type Ctx } from '../audit.js';
import { AppError, conflict, invalid, notFound } from '../errors.js';
import {
  Attachment,
  Gauge,
  IdempotencyKey,
  Item,
  Nonconformance,
  Stage,
  StageReentry,
  StageResult,
  User,
} from '../models/index.js';
import { claimUploads, presentAttachment } from './attachments.js';
import { loadResultRecords } from './result-records.js';
import { checkedSerial, findBySerial, presentItem, routeOfItem } from './items.js';
import { blockingNcrsOf, openNcrsOf, raiseNonconformance, settleRework, type FailingReading } from './ncrs/index.js';
import { referenceData, VERSION_SQL, versionRead, type Reference, type VersionRow } from './reference-cache.js';
import { formCharacteristics } from './spec.js';
import { chooseSizeClasses } from './size-classes.js';
import { checkControlLimits } from './spc/signals.js';
import { lockUnitsReachedBy } from './unit-locks.js';
import { fitOf, gaugeChoices } from './gauge-suitability.js';
import { requireQualified } from './qualifications.js';
import { nextStep, onlyOptionalBetween, stepIndex } from '../../shared/domain/route.js';

type Route = NonNullable<Awaited<ReturnType<typeof routeOfItem>>>;
type FormChar = ReturnType<typeof formCharacteristics>[number];

const lower = (s: string) => s.charAt(0).toLowerCase() + s.slice(1);

function stationByCode(ref: Reference, code: string) {
  const station = ref.station(code.toUpperCase());
  if (!station || !station.active) throw notFound(`Station ${code}`);
  const stage = station.stageId ? ref.stage(station.stageId) : undefined;
  if (!stage) throw conflict(`Station ${station.code} records no stage: an admin can set its stage.`);
  return { station, stage };
}

/** The current (not superseded) result of an item at a stage. */
async function currentResultAt(itemId: number, stageId: number, transaction?: Transaction) {
  const [row] = await (StageResult.sequelize as Sequelize).query<{ id: number }>(
    `SELECT r.id FROM stage_results r
      WHERE r.item_id = :itemId AND r.stage_id = :stageId
        AND NOT EXISTS (SELECT 1 FROM stage_results s WHERE s.supersedes_id = r.id)
      ORDER BY r.finished_at DESC, r.id DESC LIMIT 1`,
    { type: QueryTypes.SELECT, replacements: { itemId, stageId }, transaction },
  );
  return row ? StageResult.findByPk(row.id, { transaction }) : null;
}

/**
 * Whether this stage may be recorded for the item now. A part is recorded at its current stage,
 * or further on when every stage in between is optional; going back needs a supervisor's re-entry.
 */
export function checkSequence(
  item: Item,
  stage: Stage,
  route: Route | null,
  holds: { number: string }[],
  reentry: StageReentry | null,
): SequenceCheck {
  const what = PART_KIND_LABELS[item.kind].toLowerCase();
  const fail = (
    code: Exclude<SequenceCheck['code'], 'ready' | 'reentry'>,
    message: string,
    expected: Stage | null = null,
  ): SequenceCheck => ({
    ok: false,
    code,
    message,
    expectedStage: expected ? { code: expected.code, name: expected.name } : null,
  });
  if (item.kind !== stage.partKind) {
    return fail(
      'wrong_part',
      `${item.serial} is a ${what}; ${stage.name} is recorded for ${PART_KIND_LABELS[stage.partKind].toLowerCase()}s.`,
    );
  }
  if (item.status === 'scrapped') return fail('scrapped', `${item.serial} has been scrapped and cannot be recorded.`);
  if (holds.length) {
    return fail(
      'on_hold',
      `${item.serial} is on hold: ${holds.map((h) => h.number).join(', ')} ${holds.length > 1 ? 'are' : 'is'} open. Quality must decide it before this part is recorded again.`,
    );
  }
  const steps = route?.steps ?? [];
  const at = stepIndex(steps, stage.id);
  if (at < 0) return fail('not_on_route', `${stage.name} is not on the route of ${item.serial}.`);
  if (reentry && reentry.stageId === stage.id) {
    return { ok: true, code: 'reentry', message: `Re-entry allowed by a supervisor: ${reentry.reason}` };
  }
  const current = stepIndex(steps, item.currentStageId);
  if (['finished', 'installed', 'released', 'shipped'].includes(item.status) || current < 0) {
    return fail(
      'finished',
      `${item.serial} has finished its route. A supervisor can allow a re-entry of ${stage.name} with a reason.`,
    );
  }
  if (at === current) return { ok: true, code: 'ready', message: `${item.serial} is due at ${stage.name}.` };
  const next = steps[current]!.stage;
  if (at > current && onlyOptionalBetween(steps, current, at)) {
    return { ok: true, code: 'ready', message: `${item.serial} is due at ${stage.name} (optional stages skipped).` };
  }
  if (at < current) {
    return fail(
      'out_of_sequence',
      `${item.serial} has already passed ${stage.name}; its next stage is ${next.name}. A supervisor can allow a re-entry with a reason.`,
      next,
    );
  }
  return fail(
    'out_of_sequence',
    `${item.serial} is not ready for ${stage.name}: its next stage is ${next.name}.`,
    next,
  );
}

async function openReentry(itemId: number, transaction?: Transaction) {
  return StageReentry.findOne({ where: { itemId, usedByResultId: null }, transaction });
}

/** Everything a station tablet needs to record one part: the check, the form and its rules. */
export async function stationForm(stationCode: string, serial: string): Promise<StationFormJson> {
  const ref = await referenceData(Item.sequelize as Sequelize);
  const { station, stage } = stationByCode(ref, stationCode);
  const item = await findBySerial(serial);
  const family = ref.family(item.engineFamilyId)!;
  const route = ref.routeOfItem(item);
  const [holds, reentry, current] = await Promise.all([
    blockingNcrsOf(item.id, stage.id),
    openReentry(item.id),
    currentResultAt(item.id, stage.id),
  ]);
  const characteristics = formCharacteristics(ref, stage.id, family.id, new Date(), (c) =>
    expandPositions(c.positions, family, item),
  );
  const gauges = gaugeChoices(ref, characteristics);
  const operator = current ? await User.findByPk(current.operatorId, { attributes: ['name'] }) : null;
  const rework = await Nonconformance.findOne({
    where: {
      itemId: item.id,
      state: 'decided',
      reworkStageId: stage.id,
      disposition: { [Op.in]: ['rework', 'repair'] },
    },
    order: [['id', 'DESC']],
  });
  return {
    station: { code: station.code, name: station.name, location: station.location },
    stage: { code: stage.code, name: stage.name, hazard: stage.hazard, description: stage.description },
    item: await presentItem(item, { route, ref }),
    sequence: checkSequence(item, stage, route, holds, reentry),
    holds,
    characteristics: characteristics.map(({ id: _id, defectCode: _d, ...c }) => c),
    gauges: gauges.choices,
    rework: rework
      ? { number: rework.number, disposition: rework.disposition!, reason: rework.dispositionReason ?? '' }
      : null,
    currentResult: current
      ? {
          id: current.id,
          verdict: current.verdict,
          finishedAt: current.finishedAt.toISOString(),
          operator: operator?.name ?? '',
        }
      : null,
  };
}

// the tablet's time is left out: a retry sent a moment later is still the same result
const hashBody = (body: SubmitResultBody) =>
  createHash('sha256')
    .update(canonicalize({ ...body, takenAt: undefined }) ?? '')
    .digest('hex');

/** A tablet's clock may run a little ahead of the server's; beyond this, its time is refused. */
const CLOCK_AHEAD_MS = 5 * 60_000;
/** A result kept on a tablet longer than a week is refused: take the reading again. */
const QUEUED_AT_MOST_MS = 7 * 24 * 3_600_000;

/**
 * When the result was taken on the tablet: what it says, checked against the server's clock, or the
 * moment it arrived when it says nothing (an older tablet page).
 */
function tabletTime(body: SubmitResultBody, now: Date): Date {
  if (!body.takenAt) return now;
  const taken = new Date(body.takenAt);
  if (taken.getTime() > now.getTime() + CLOCK_AHEAD_MS) {
    throw invalid("The tablet's clock is ahead of the server's. Set its time, then record again.", {
      takenAt: 'Later than the server’s time.',
    });
  }
  if (now.getTime() - taken.getTime() > QUEUED_AT_MOST_MS) {
    throw invalid('This result was kept on the tablet for more than a week. Nothing was recorded: take it again.', {
      takenAt: 'More than 7 days ago.',
    });
  }
  if (body.startedAt && taken.getTime() < new Date(body.startedAt).getTime()) {
    throw invalid('The result was taken before its form was opened: check the tablet’s clock.', {
      takenAt: 'Before the form was opened (startedAt).',
    });
  }
  return taken;
}

/** A reading as typed, when it was typed in another unit than its characteristic's. */
type Entered = { value: number; unit: string };

/** The largest magnitude a reading column (numeric(14, 6)) holds. */
const READING_MAX = 1e8;

/**
 * A typed value in the characteristic's unit: as is when sent in that unit (or with none), else
 * converted with the NIST SP 811 factors (shared/domain/units) and kept to the column's 6 decimals,
 * the same figure that is stored and judged. null when the unit is not of the same quantity.
 */
function inUnitOf(
  c: Pick<FormChar, 'unit'>,
  value: number,
  unit: string | undefined,
): { ok: true; value: number; entered: Entered | null } | { ok: false; message: string } | null {
  if (unit === undefined || unit === c.unit) return { ok: true, value, entered: null };
  const symbol = unitOf(unit)?.symbol;
  if (symbol === c.unit) return { ok: true, value, entered: null };
  const converted = convertDecimal(value, symbol, c.unit);
  if (!converted || !symbol) return null;
  const v = converted.toDecimalPlaces(6).toNumber();
  if (!(Math.abs(v) < READING_MAX)) return { ok: false, message: `beyond what a reading in ${c.unit} can hold` };
  return { ok: true, value: v, entered: { value, unit: symbol } };
}

/**
 * Checks what was typed against the form: every position present once, numbers for measured
 * characteristics in their unit and physical range, pass/fail for checks. All problems at once,
 * keyed `characteristic@position`.
 */
function checkReadings(
  chars: FormChar[],
  body: SubmitResultBody,
): { entries: Entries; locations: Map<string, string>; entered: Map<string, Entered> } {
  const fields: Record<string, string> = {};
  const entries: Entries = {};
  const locations = new Map<string, string>();
  const entered = new Map<string, Entered>();
  const byCode = new Map(chars.map((c) => [c.code, c]));
  body.readings.forEach((r, i) => {
    const key = `${r.characteristic}@${r.position}`;
    const c = byCode.get(r.characteristic);
    if (!c) {
      fields[`readings.${i}.characteristic`] = `${r.characteristic} is not recorded at this stage.`;
      return;
    }
    if (c.kind === 'derived') {
      fields[key] = `${c.name} is worked out by Coretrail from the other readings: do not send it.`;
      return;
    }
    const pos = c.positions.find((p) => p.code === r.position);
    if (!pos) {
      fields[key] =
        `${r.position ? `“${r.position}”` : 'No position'} is not a position of ${lower(c.name)} on this part.`;
      return;
    }
    if (entries[c.code]?.[r.position]) {
      fields[key] = `${pos.label}: ${lower(c.name)} was sent twice.`;
      return;
    }
    let value = r.value ?? null;
    if (c.kind === 'variable') {
      const converted = r.value === undefined ? null : inUnitOf(c, r.value, r.unit);
      if (r.passed !== undefined) fields[key] = `${c.name} is measured: send a value, not pass/fail.`;
      else if (r.value === undefined) fields[key] = `${pos.label}: enter the ${lower(c.name)}.`;
      else if (!converted) {
        fields[key] =
          `${c.name} is recorded in ${c.unit}: ${r.unit || 'no unit'} is not a unit of the same quantity, so it cannot be converted.`;
      } else if (!converted.ok) {
        fields[key] = `${r.value} ${r.unit} is ${converted.message}: check the reading.`;
      } else if (!physicallyPossible(c, converted.value)) {
        const shown = converted.entered
          ? `${r.value} ${r.unit} (${converted.value} ${c.unit})`
          : `${r.value} ${c.unit ?? ''}`;
        fields[key] =
          `${shown} is not a possible ${lower(c.name)} (${c.physicalMin}–${c.physicalMax} ${c.unit ?? ''}): check the reading.`.replace(
            /\s+/g,
            ' ',
          );
      } else {
        value = converted.value;
        if (converted.entered) entered.set(key, converted.entered);
      }
    } else {
      if (r.value !== undefined) fields[key] = `${c.name} is a pass/fail check: send pass or fail, not a value.`;
      else if (r.passed === undefined) fields[key] = `${pos.label}: choose pass or fail for ${lower(c.name)}.`;
      else if (!r.passed && c.critical && !r.location) {
        fields[key] = `${c.name} failed: say where (the location field).`;
      }
    }
    (entries[c.code] ??= {})[r.position] = { value, passed: r.passed ?? null };
    if (r.location) locations.set(key, r.location);
  });
  for (const c of chars) {
    if (c.kind === 'derived' || c.optional) continue;
    for (const p of c.positions) {
      if (!entries[c.code]?.[p.code] && !fields[`${c.code}@${p.code}`]) {
        fields[`${c.code}@${p.code}`] = `Missing: ${p.label} — ${lower(c.name)}.`;
      }
    }
  }
  const problems = Object.keys(fields).length;
  if (problems) {
    throw invalid(`${problems} reading${problems > 1 ? 's need' : ' needs'} attention. Nothing was recorded.`, fields);
  }
  return { entries, locations, entered };
}

type Outcome = { status: number; body: ResultJson; replay: boolean };

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
    correction?: { resultId: number; reason: string } | null;
    /** The shared station tablet the person identified on (badge and PIN), kept with the result. */
    tablet?: { id: number; label: string } | null;
  } = {},
): Promise<Outcome> {
  const requestHash = hashBody(body);
  return sequelize.transaction(async (transaction) => {
    // two requests with one key take turns here; the second finds the first's stored reply. The
    // same statement reads the reference data's version (families, stations, routes, rules, gauges)
    const [version] = await sequelize.query<VersionRow>(
      `SELECT pg_advisory_xact_lock(hashtextextended(:key, 7241)) AS locked, v.* FROM (${VERSION_SQL}) v`,
      { replacements: { key: body.idempotencyKey }, type: QueryTypes.SELECT, transaction },
    );
    const seen = await IdempotencyKey.findByPk(body.idempotencyKey, { transaction });
    if (seen) {
      if (seen.userId !== ctx.actor!.id || seen.requestHash !== requestHash || seen.path !== path) {
        throw new AppError(
          422,
          'idempotency_key_reused',
          'This idempotency key was already used for a different submission. Nothing was recorded; send a new key for a new result.',
        );
      }
      return { status: seen.statusCode, body: seen.response as ResultJson, replay: true };
    }

    const ref = await referenceData(sequelize, transaction, versionRead(version));
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

    let supersedes: StageResult | null = null;
    if (correction) {
      supersedes = await currentResultAt(item.id, stage.id, transaction);
      if (!supersedes || supersedes.id !== correction.resultId) {
        throw conflict(
          `Result ${correction.resultId} is not the current ${stage.name} result of ${item.serial}: only the current result can be corrected.`,
          { reason: 'not_current' },
        );
      }
      if (item.kind !== stage.partKind || item.status === 'scrapped') {
        throw conflict(`${item.serial} cannot take a correction at ${stage.name}.`);
      }
    } else {
      const check = checkSequence(item, stage, route, holds, reentry);
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
    }

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

    // the result's gauge, and any measured characteristic taken with another one
    const gauges = gaugeChoices(ref, chars);
    const usableGauge = (code: string, field: string) => {
      const g = gauges.byCode.get(code.toUpperCase()) ?? null;
      const choice = gauges.choices.find((x) => x.code === g?.code);
      if (!g || !choice) throw invalid('Choose a gauge from the list.', { [field]: `No gauge ${code}.` });
      if (!choice.usable)
        throw invalid(`${g.code} cannot be used: ${choice.why} Use another gauge.`, { [field]: choice.why });
      return g;
    };
    const gauge: Gauge | null = body.gauge ? usableGauge(body.gauge, 'gauge') : null;
    const gaugeOf = new Map<string, Gauge>();
    for (const [code, g] of Object.entries(body.gauges)) {
      const c = chars.find((x) => x.code === code);
      if (!c || c.kind !== 'variable') {
        throw invalid(`${code} is not measured at this stage.`, {
          [`gauges.${code}`]: 'Not a measured characteristic here.',
        });
      }
      gaugeOf.set(code, usableGauge(g, `gauges.${code}`));
    }
    // a gauge names the instrument a reading was taken with: none for a reading nobody took
    for (const code of gaugeOf.keys()) {
      if (!body.readings.some((r) => r.characteristic === code)) {
        const c = chars.find((x) => x.code === code)!;
        throw invalid(`No ${lower(c.name)} was entered: leave its gauge out.`, {
          [`gauges.${code}`]: `No ${lower(c.name)} reading was entered, so no gauge was used for it.`,
        });
      }
    }
    const unmeasured = chars.filter((c) => c.kind === 'variable' && !c.optional && !gaugeOf.has(c.code));
    if (!gauge && unmeasured.length) {
      throw invalid('Choose the gauge the readings were taken with.', { gauge: 'Choose the gauge used.' });
    }
    // each measured characteristic read must be within what its gauge can measure (unit, range, resolution)
    const unsuitable: Record<string, string> = {};
    for (const c of chars) {
      if (c.kind !== 'variable' || !body.readings.some((r) => r.characteristic === c.code)) continue;
      const g = gaugeOf.get(c.code) ?? gauge;
      if (!g) continue;
      const fit = fitOf(ref, g, c);
      if (!fit.ok) unsuitable[gaugeOf.has(c.code) ? `gauges.${c.code}` : 'gauge'] ??= fit.message;
    }
    const refused = Object.values(unsuitable);
    if (refused.length) {
      throw new AppError(
        400,
        'gauge_unsuitable',
        `${refused[0]} Choose a gauge that can measure it. Nothing was recorded.`,
        unsuitable,
      );
    }

    // the size class chosen (a bore's oversize …) sets the limits its readings are judged to
    const sizeClasses = chooseSizeClasses(ref, chars, body.sizeClasses);
    const { entries, locations, entered } = checkReadings(chars, body);
    const judged = evaluateForm(chars, entries);
    const verdict = judged.verdict === 'pass' ? 'pass' : 'fail';

    const result = await StageResult.create(
      {
        itemId: item.id,
        stageId: stage.id,
        stationId: station.id,
        operatorId: ctx.actor!.id,
        gaugeId: gauge?.id ?? null,
        startedAt: body.startedAt ? new Date(body.startedAt) : null,
        finishedAt: now,
        takenAt,
        verdict,
        idempotencyKey: body.idempotencyKey,
        supersedesId: supersedes?.id ?? null,
        correctionReason: correction?.reason ?? null,
        reentryReason: reentry && reentry.stageId === stage.id && !supersedes ? reentry.reason : null,
        reentryById: reentry && reentry.stageId === stage.id && !supersedes ? reentry.allowedById : null,
        notes: body.notes,
        tabletId: tablet?.id ?? null,
        sizeClasses,
      },
      { transaction },
    );
    const charByCode = new Map(chars.map((c) => [c.code, c]));
    // one INSERT of plain rows: no model instances built, nothing returned
    await sequelize.getQueryInterface().bulkInsert(
      'readings',
      judged.readings.map((r) => {
        const c = charByCode.get(r.characteristic)!;
        return {
          stage_result_id: result.id,
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
      { transaction },
    );
    if (reentry && reentry.stageId === stage.id && !supersedes) {
      await reentry.update({ usedByResultId: result.id }, { transaction });
    }
    await claimUploads(ctx, transaction, body.photoIds, 'stage_result', result.id);

    const readings: ReadingJson[] = judged.readings.map((r) => {
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
    const failing = readings.filter((r) => r.verdict === 'fail');

    // where the part goes next
    const before = { status: item.status, currentStage: item.currentStageId };
    let ncr = null;
    if (verdict === 'fail') {
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
      ncr = await raiseNonconformance(sequelize, ctx, transaction, {
        itemId: item.id,
        itemSerial: item.serial,
        itemStatusBefore: before.status,
        stageId: stage.id,
        stageResultId: result.id,
        severity: critical ? 'critical' : 'major',
        defectCode: first.defectCode,
        description: `${stage.name} failed on ${item.serial}: ${shown.join('; ')}${failing.length > 4 ? `; and ${failing.length - 4} more` : ''}.`,
        failing: snapshot,
        origin: `Raised by the failing ${stage.name} result recorded at ${station.name}`,
      });
      await item.update({ status: 'on_hold', currentStageId: stage.id }, { transaction });
    } else if (!supersedes) {
      const steps = route?.steps ?? [];
      const next = nextStep(steps, stage.id);
      await item.update(
        next ? { status: 'in_process', currentStageId: next.stageId } : { status: 'finished', currentStageId: null },
        { transaction },
      );
    }

    if (!supersedes) await settleRework(ctx, transaction, item, stage.id, result, ncr, stage.name);
    // a run-rule signal against frozen control limits mails quality and may hold the part
    await checkControlLimits(sequelize, ctx, transaction, { ref, item, stage, station, resultId: result.id });

    // the next stage is on the route already read; the operator's name came with the session
    const nextStage = item.currentStageId
      ? (route?.steps.find((s) => s.stageId === item.currentStageId)?.stage ??
        (await Stage.findByPk(item.currentStageId, { transaction })))
      : null;
    const operatorName =
      ctx.actor!.name ?? (await User.findByPk(ctx.actor!.id, { attributes: ['name'], transaction }))?.name ?? '';
    const photos = body.photoIds.length
      ? (await Attachment.findAll({ where: { entity: 'stage_result', entityId: String(result.id) }, transaction })).map(
          presentAttachment,
        )
      : [];
    const reply: ResultJson = {
      id: result.id,
      serial: item.serial,
      stage: { code: stage.code, name: stage.name },
      station: { code: station.code, name: station.name },
      operator: operatorName,
      gauge: gauge?.code ?? null,
      verdict,
      finishedAt: now.toISOString(),
      takenAt: takenAt.toISOString(),
      notes: result.notes,
      readings,
      sizeClasses: result.sizeClasses,
      failing,
      nonconformance: ncr ? { number: ncr.number, severity: ncr.severity } : null,
      supersedes: supersedes?.id ?? null,
      correctionReason: result.correctionReason,
      reentryReason: result.reentryReason,
      photos,
      item: {
        status: item.status,
        currentStage: nextStage ? { code: nextStage.code, name: nextStage.name } : null,
      },
    };
    await IdempotencyKey.create(
      {
        key: body.idempotencyKey,
        userId: ctx.actor!.id,
        method: 'POST',
        path,
        requestHash,
        statusCode: 201,
        response: reply,
      },
      { transaction, returning: false },
    );
    // Last: the first event takes the audit chain's lock, which every writer waits for until this
    // transaction commits, so a pass holds it for these inserts alone (a failure's NCR took it earlier).
    await recordAudit(ctx, transaction, {
      action: supersedes ? 'result.corrected' : 'result.recorded',
      entity: 'stage_result',
      entityId: result.id,
      before: supersedes ? { resultId: supersedes.id, verdict: supersedes.verdict } : undefined,
      after: {
        item: item.serial,
        stage: stage.code,
        station: station.code,
        gauge: gauge?.code ?? null,
        gauges: Object.fromEntries([...gaugeOf].map(([c, g]) => [c, g.code])),
        verdict,
        takenAt: takenAt.toISOString(),
        idempotencyKey: body.idempotencyKey,
        correctionReason: correction?.reason ?? null,
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
        action: verdict === 'fail' ? 'item.held' : 'item.moved',
        entity: 'item',
        entityId: item.serial,
        before,
        after: { status: item.status, currentStage: item.currentStageId, byResult: result.id },
      });
    }
    return { status: 201, body: reply, replay: false };
  });
}

/**
 * A supervisor's sanctioned re-entry: the item goes back to a stage it has passed (or finished),
 * and the next result there carries the reason.
 */
export async function allowReentry(
  sequelize: Sequelize,
  ctx: Ctx,
  serial: string,
  input: { stage: string; reason: string },
) {
  await sequelize.transaction(async (transaction) => {
    const found = await findBySerial(serial, transaction);
    const item = (await Item.findByPk(found.id, { transaction, lock: transaction.LOCK.UPDATE }))!;
    const stage = await Stage.findOne({ where: { code: input.stage }, transaction });
    if (!stage) throw invalid('Choose a stage of this part’s route.', { stage: `No stage ${input.stage}.` });
    const route = await routeOfItem(item, transaction);
    if (!route?.steps.some((s) => s.stageId === stage.id)) {
      throw invalid(`${stage.name} is not on the route of ${item.serial}.`, { stage: 'Not on this route.' });
    }
    if (['scrapped', 'installed', 'released', 'shipped'].includes(item.status)) {
      throw conflict(`${item.serial} is ${item.status}: it cannot go back through a stage.`);
    }
    const holds = await openNcrsOf(item.id, transaction);
    if (holds.length) {
      throw conflict(
        `${item.serial} is on hold with ${holds.map((h) => h.number).join(', ')}: quality sends it back through a stage by disposition (rework).`,
      );
    }
    if (item.currentStageId === stage.id && item.status === 'in_process') {
      throw conflict(`${item.serial} is already due at ${stage.name}: no re-entry is needed.`);
    }
    const waiting = await openReentry(item.id, transaction);
    if (waiting) {
      throw conflict(`A re-entry of ${item.serial} is already waiting to be used: record that stage first.`);
    }
    const before = { status: item.status, currentStage: item.currentStageId };
    await StageReentry.create(
      {
        itemId: item.id,
        stageId: stage.id,
        fromStageId: item.currentStageId,
        fromStatus: item.status,
        reason: input.reason,
        allowedById: ctx.actor!.id,
        usedByResultId: null,
      },
      { transaction },
    );
    await item.update({ status: 'in_process', currentStageId: stage.id }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'item.reentry_allowed',
      entity: 'item',
      entityId: item.serial,
      before,
      after: { status: item.status, currentStage: stage.id, stage: stage.code, reason: input.reason },
    });
  });
  return presentItem(await findBySerial(serial));
}

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

export type StationQueueJson = { code: string; waiting: number; rank: number };

/**
 * Each station in service with how many parts wait at its stage now, in route order: the stage's
 * earliest place on any route, then the stage's id (the order the line was set up in).
 */
export async function stationQueues(sequelize: Sequelize): Promise<StationQueueJson[]> {
  const rows = await sequelize.query<{ code: string; waiting: number }>(
    `SELECT s.code, coalesce(q.waiting, 0)::int AS waiting
       FROM stations s
       JOIN stages g ON g.id = s.stage_id
       LEFT JOIN (SELECT stage_id, min(position) AS position FROM route_stages GROUP BY stage_id) r ON r.stage_id = s.stage_id
       LEFT JOIN (SELECT current_stage_id, count(*) AS waiting FROM items
                   WHERE current_stage_id IS NOT NULL AND status = 'in_process' GROUP BY current_stage_id) q
              ON q.current_stage_id = s.stage_id
      WHERE s.active
      ORDER BY coalesce(r.position, 2147483647), g.id, s.code`,
    { type: QueryTypes.SELECT },
  );
  return rows.map((r, i) => ({ code: r.code, waiting: r.waiting, rank: i }));
}
