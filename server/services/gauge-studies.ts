import type { Sequelize } from 'sequelize';
import { attributeAgreement, attributeBands } from '../../shared/domain/attribute-study.js';
import type { Band } from '../../shared/domain/gauge-study.js';
import { anovaGaugeStudy } from '../../shared/domain/gauge-rr-anova.js';
import { averageAndRange } from '../../shared/domain/gauge-rr-range.js';
import { StudyDataError } from '../../shared/domain/study-error.js';
import type { ApproveStudyBody, StudyBody, StudyJson } from '../../shared/schemas/gauges.js';
import { recordAudit, type Ctx } from '../audit.js';
import { conflict, invalid, notFound } from '../errors.js';
import { Gauge, GaugeStudy, Signature, User } from '../models/index.js';
import { findGauge } from './gauges.js';
import { presentSignature, signWithPassword } from './signatures.js';

/**
 * Gauge studies (MSA) stored with their grid and figures. The statistics are shared/domain's
 * (average-and-range and ANOVA per the AIAG MSA 4th edition; Cohen's and Fleiss' kappa); this file
 * only runs them on what was entered, keeps the result, and flags the gauge when the last study
 * was unacceptable.
 */

const worst = (bands: Band[]): Band =>
  bands.includes('unacceptable') ? 'unacceptable' : bands.includes('conditional') ? 'conditional' : 'acceptable';

function analyse(body: StudyBody): { result: unknown; verdict: Band } {
  try {
    if (body.method === 'attribute') {
      // misses and false alarms need the right answer for each part; without one, agreement alone
      const result = attributeAgreement({
        ratings: body.ratings,
        reference: body.reference,
        nonconforming: body.reference ? 'fail' : null,
      });
      const bands: Band[] = [];
      if (result.overallKappa) bands.push(attributeBands.kappa(result.overallKappa.kappa));
      for (const a of result.appraisers) {
        if (a.effectiveness?.percent != null) bands.push(attributeBands.effectiveness(a.effectiveness.percent));
        if (a.misses?.percent != null) bands.push(attributeBands.missRate(a.misses.percent));
        if (a.falseAlarms?.percent != null) bands.push(attributeBands.falseAlarmRate(a.falseAlarms.percent));
      }
      if (!bands.length)
        throw new StudyDataError('the judgements give nothing to rate: every part was judged the same', 'ratings');
      return { result, verdict: worst(bands) };
    }
    const options = { tolerance: body.tolerance };
    const result =
      body.method === 'range' ? averageAndRange(body.readings, options) : anovaGaugeStudy(body.readings, options);
    return { result, verdict: result.verdict };
  } catch (err) {
    if (err instanceof StudyDataError) {
      throw invalid(`The study cannot be worked out: ${err.message}.`, { [err.field ?? 'readings']: err.message });
    }
    throw err;
  }
}

/** A study's signatures are kept under this entity, with the study's id. */
const STUDY_ENTITY = 'gauge_study';

const present = (
  s: GaugeStudy & { recordedBy?: User | null },
  gauge: string,
  approval: Signature | null,
): StudyJson => ({
  id: s.id,
  gauge,
  method: s.method,
  characteristic: s.characteristic,
  tolerance: s.tolerance === null ? null : Number(s.tolerance),
  verdict: s.verdict,
  data: s.data as StudyJson['data'],
  result: s.result,
  recordedBy: s.recordedBy?.name ?? '',
  recordedAt: s.createdAt.toISOString(),
  approval: approval ? presentSignature(approval) : null,
});

export async function recordStudy(sequelize: Sequelize, ctx: Ctx, code: string, body: StudyBody): Promise<StudyJson> {
  const { result, verdict } = analyse(body);
  return sequelize.transaction(async (transaction) => {
    const g = await findGauge(code, transaction, true);
    const s = await GaugeStudy.create(
      {
        gaugeId: g.id,
        method: body.method,
        characteristic: body.characteristic,
        tolerance: body.method === 'attribute' ? null : body.tolerance,
        data:
          body.method === 'attribute'
            ? { ratings: body.ratings, reference: body.reference }
            : { readings: body.readings },
        result,
        verdict,
        recordedById: ctx.actor!.id,
      },
      { transaction },
    );
    const before = { studyVerdict: g.studyVerdict ?? null };
    await g.update({ studyVerdict: verdict }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'gauge.studied',
      entity: 'gauge',
      entityId: g.code,
      before,
      after: { studyId: s.id, method: body.method, characteristic: body.characteristic, verdict },
    });
    return present(s, g.code, null);
  });
}

export async function listStudies(code: string): Promise<StudyJson[]> {
  const g = await findGauge(code);
  const rows = await GaugeStudy.findAll({
    where: { gaugeId: g.id },
    include: [{ model: User, as: 'recordedBy', attributes: ['name'] }],
    order: [
      ['createdAt', 'DESC'],
      ['id', 'DESC'],
    ],
  });
  const signatures = rows.length
    ? await Signature.findAll({ where: { entity: STUDY_ENTITY, entityId: rows.map((s) => String(s.id)) } })
    : [];
  const byStudy = new Map(signatures.map((sig) => [sig.entityId, sig]));
  return rows.map((s) => present(s, g.code, byStudy.get(String(s.id)) ?? null));
}

/**
 * Quality approves a study as a record with a signature: who, what it means, why and when. A
 * study is approved once; the study row is locked first, so two approvals at once sign it once.
 */
export async function approveStudy(
  sequelize: Sequelize,
  ctx: Ctx,
  id: number,
  body: ApproveStudyBody,
): Promise<StudyJson> {
  return sequelize.transaction(async (transaction) => {
    const s = await GaugeStudy.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!s) throw notFound(`Gauge study ${id}`);
    const g = (await Gauge.findByPk(s.gaugeId, { transaction }))!;
    const entityId = String(s.id);
    if (await Signature.findOne({ where: { entity: STUDY_ENTITY, entityId }, transaction })) {
      throw conflict('This study is already approved.', { reason: 'already_approved' });
    }
    const { signature } = await signWithPassword(ctx, transaction, {
      entity: STUDY_ENTITY,
      entityId,
      meaning: `Approved the ${METHOD_WORDS[s.method]} study of ${g.code} (${s.characteristic}), verdict ${s.verdict}`,
      reason: body.reason,
      password: body.password,
      refused: 'the study was not approved.',
    });
    await recordAudit(ctx, transaction, {
      action: 'gauge_study.approved',
      entity: 'gauge_study',
      entityId,
      before: { approved: false },
      after: {
        approved: true,
        gauge: g.code,
        method: s.method,
        verdict: s.verdict,
        signedBy: signature.printedName,
        meaning: signature.meaning,
        reason: signature.reason,
        signedAt: signature.signedAt.toISOString(),
      },
    });
    const recordedBy = await User.findByPk(s.recordedById, { attributes: ['name'], transaction });
    return present(Object.assign(s, { recordedBy }), g.code, signature);
  });
}

const METHOD_WORDS: Record<GaugeStudy['method'], string> = {
  range: 'average-and-range gauge R&R',
  anova: 'ANOVA gauge R&R',
  attribute: 'attribute agreement',
};
