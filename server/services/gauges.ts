import type { Sequelize } from 'sequelize';
import { asFoundError } from '../../shared/domain/gauge-fit.js';
import { todayIn } from '../../shared/domain/warranty.js';
import type {
  CalibrationBody,
  CalibrationJson,
  GaugeBody,
  GaugeJson,
  GaugeStatus,
} from '../../shared/schemas/gauges.js';
import { recordAudit, type Ctx } from '../audit.js';
import { conflict, invalid, notFound } from '../errors.js';
import { Attachment, Characteristic, Gauge, GaugeCalibration, User } from '../models/index.js';
import { daysBetween, gaugeState } from './gauge-suitability.js';
import { plantSettings } from './plant.js';

/**
 * The gauge register and its calibration records (ISO 9001:2015 7.1.5.2). A gauge is registered
 * without a calibration and takes no judged reading until one leaves it in tolerance. A calibration
 * found out of tolerance as found takes the gauge out of use until quality has assessed what it
 * measured since its last good calibration (the blast radius) and returns it with a reason.
 */

const num = (v: unknown) => (v === null || v === undefined ? null : Number(v));

export function presentGauge(g: Gauge, today: string): GaugeJson {
  const s = gaugeState(g, today);
  return {
    code: g.code,
    description: g.description,
    kind: g.kind,
    serial: g.serial,
    unit: g.unit,
    resolution: num(g.resolution),
    rangeLow: num(g.rangeLow),
    rangeHigh: num(g.rangeHigh),
    location: g.location,
    owner: g.owner,
    intervalDays: g.intervalDays,
    status: g.status,
    state: s.state,
    calibrated: g.calibrated,
    lastCalibratedOn: g.lastCalibratedOn ?? null,
    calibrationDueOn: g.calibrationDueOn,
    daysLeft: g.calibrationDueOn ? daysBetween(today, g.calibrationDueOn) : null,
    studyVerdict: g.studyVerdict ?? null,
  };
}

export const plantToday = async () => todayIn((await plantSettings()).timeZone);

/** Every gauge, those needing attention first: overdue, never calibrated, due soonest. */
export async function listGauges(): Promise<{ today: string; rows: GaugeJson[] }> {
  const today = await plantToday();
  const gauges = await Gauge.findAll({ order: [['code', 'ASC']] });
  const rows = gauges.map((g) => presentGauge(g, today));
  const rank = (r: GaugeJson) => (r.status === 'retired' ? 2 : r.daysLeft === null ? -1 : 0);
  rows.sort((a, b) => rank(a) - rank(b) || (a.daysLeft ?? 0) - (b.daysLeft ?? 0) || a.code.localeCompare(b.code));
  return { today, rows };
}

export async function findGauge(code: string, transaction?: import('sequelize').Transaction, lock = false) {
  const g = await Gauge.findOne({
    where: { code },
    transaction,
    ...(lock && transaction ? { lock: transaction.LOCK.UPDATE } : {}),
  });
  if (!g) throw notFound(`Gauge ${code}`);
  return g;
}

export function presentCalibration(c: GaugeCalibration & { recordedBy?: User | null }): CalibrationJson {
  return {
    id: c.id,
    calibratedOn: c.calibratedOn,
    dueOn: c.dueOn,
    result: c.result,
    asFoundInTolerance: c.asFoundInTolerance,
    asLeftInTolerance: c.asLeftInTolerance,
    asFoundError: Number(c.asFoundError),
    points: c.points,
    performedBy: c.performedBy,
    performer: c.performer,
    certificate: c.certificate,
    certificateUrl: c.certificateAttachmentId ? `/api/attachments/${c.certificateAttachmentId}` : null,
    notes: c.notes,
    recordedBy: c.recordedBy?.name ?? null,
    recordedAt: c.createdAt.toISOString(),
  };
}

export async function gaugeDetail(code: string) {
  const today = await plantToday();
  const g = await findGauge(code);
  const calibrations = await GaugeCalibration.findAll({
    where: { gaugeId: g.id },
    include: [{ model: User, as: 'recordedBy', attributes: ['name'] }],
    order: [
      ['calibratedOn', 'DESC'],
      ['id', 'DESC'],
    ],
  });
  return { today, gauge: presentGauge(g, today), calibrations: calibrations.map(presentCalibration) };
}

export async function registerGauge(sequelize: Sequelize, ctx: Ctx, body: GaugeBody): Promise<GaugeJson> {
  return sequelize.transaction(async (transaction) => {
    if (await Gauge.findOne({ where: { code: body.code }, transaction })) {
      throw conflict(`There is already a gauge ${body.code}.`, { reason: 'duplicate' });
    }
    const g = await Gauge.create({ ...body, calibrationDueOn: null, status: 'in_use' }, { transaction });
    await recordAudit(ctx, transaction, { action: 'gauge.registered', entity: 'gauge', entityId: g.code, after: body });
    return presentGauge(g, todayIn((await plantSettings(transaction)).timeZone));
  });
}

export async function setGaugeStatus(
  sequelize: Sequelize,
  ctx: Ctx,
  code: string,
  body: { status: GaugeStatus; reason: string },
): Promise<GaugeJson> {
  return sequelize.transaction(async (transaction) => {
    const g = await findGauge(code, transaction, true);
    if (g.status === body.status) throw conflict(`${g.code} is already ${body.status.replace(/_/g, ' ')}.`);
    if (g.status === 'retired') throw conflict(`${g.code} is retired: register a new gauge instead.`);
    const before = { status: g.status };
    await g.update({ status: body.status }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'gauge.status_changed',
      entity: 'gauge',
      entityId: g.code,
      before,
      after: { status: body.status, reason: body.reason },
    });
    return presentGauge(g, todayIn((await plantSettings(transaction)).timeZone));
  });
}

const addDays = (date: string, days: number) =>
  new Date(Date.parse(`${date}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);

/** A calibration record, never edited: a mistake is corrected by a later record. */
export async function recordCalibration(
  sequelize: Sequelize,
  ctx: Ctx,
  code: string,
  body: CalibrationBody,
): Promise<CalibrationJson> {
  return sequelize.transaction(async (transaction) => {
    const g = await findGauge(code, transaction, true);
    const today = todayIn((await plantSettings(transaction)).timeZone);
    if (g.status === 'retired') throw conflict(`${g.code} is retired.`);
    if (body.calibratedOn > today) {
      throw invalid('A calibration cannot be dated after today.', { calibratedOn: `Today is ${today} at the plant.` });
    }
    if (g.lastCalibratedOn && body.calibratedOn < g.lastCalibratedOn) {
      throw invalid(
        `${g.code} was last calibrated on ${g.lastCalibratedOn}: a calibration cannot be dated before it.`,
        {
          calibratedOn: `On or after ${g.lastCalibratedOn}.`,
        },
      );
    }
    if (!g.intervalDays) {
      throw conflict(`${g.code} has no calibration interval: set one before recording a calibration.`);
    }
    if (body.certificateAttachmentId) {
      const [claimed] = await Attachment.update(
        { entity: 'gauge_calibration', entityId: g.code },
        {
          where: {
            id: body.certificateAttachmentId,
            entity: 'pending',
            uploadedById: ctx.actor!.id,
            mimeType: 'application/pdf',
          },
          transaction,
        },
      );
      if (claimed !== 1) {
        throw invalid('The certificate could not be attached: upload the PDF again.', {
          certificateAttachmentId: 'Unknown or already used certificate.',
        });
      }
    }
    const inTol = (v: number, p: { reference: number; tolerance: number }) =>
      Math.abs(v - p.reference) <= p.tolerance + 1e-12;
    const asFoundInTolerance = body.points.every((p) => inTol(p.asFound, p));
    const asLeftInTolerance = body.points.every((p) => inTol(p.asLeft, p));
    const adjusted = body.points.some((p) => p.asLeft !== p.asFound);
    const result = !asFoundInTolerance ? 'out_of_tolerance' : adjusted ? 'adjusted' : 'in_tolerance';
    const dueOn = addDays(body.calibratedOn, g.intervalDays);
    const c = await GaugeCalibration.create(
      {
        gaugeId: g.id,
        calibratedOn: body.calibratedOn,
        dueOn,
        result,
        certificate: body.certificate || null,
        asFoundInTolerance,
        asLeftInTolerance,
        asFoundError: asFoundError(body.points),
        points: body.points,
        performedBy: body.performedBy,
        performer: body.performer,
        certificateAttachmentId: body.certificateAttachmentId,
        notes: body.notes,
        recordedById: ctx.actor!.id,
      },
      { transaction },
    );
    const before = { status: g.status, calibrated: g.calibrated, calibrationDueOn: g.calibrationDueOn };
    const status: GaugeStatus =
      !asFoundInTolerance || !asLeftInTolerance
        ? 'out_of_tolerance'
        : g.status === 'out_for_calibration'
          ? 'in_use'
          : g.status;
    await g.update(
      {
        status,
        calibrated: asLeftInTolerance,
        calibrationDueOn: dueOn,
        lastCalibratedOn: body.calibratedOn,
      },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'gauge.calibrated',
      entity: 'gauge',
      entityId: g.code,
      before,
      after: {
        calibrationId: c.id,
        calibratedOn: c.calibratedOn,
        result,
        asFoundInTolerance,
        asLeftInTolerance,
        asFoundError: Number(c.asFoundError),
        points: body.points,
        performedBy: body.performedBy,
        performer: body.performer,
        certificate: c.certificate,
        status,
        calibrationDueOn: dueOn,
      },
    });
    return presentCalibration(c);
  });
}

/** Relaxes (or restores) the 10 : 1 resolution rule for one characteristic, with the reason on record. */
export async function setGaugeRatio(
  sequelize: Sequelize,
  ctx: Ctx,
  characteristicId: number,
  body: { ratio: number | null; reason: string },
) {
  return sequelize.transaction(async (transaction) => {
    const c = await Characteristic.findByPk(characteristicId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!c) throw notFound(`Characteristic ${characteristicId}`);
    if (c.kind !== 'variable') throw conflict(`${c.name} is not measured with a gauge.`);
    const ratio = body.ratio === null || body.ratio === 10 ? null : body.ratio;
    const before = { gaugeRatio: num(c.gaugeRatio) ?? 10, reason: c.gaugeRatioReason };
    await c.update({ gaugeRatio: ratio, gaugeRatioReason: ratio === null ? null : body.reason }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'characteristic.gauge_ratio_set',
      entity: 'characteristic',
      entityId: c.id,
      before,
      after: { gaugeRatio: ratio ?? 10, reason: body.reason },
    });
    return {
      id: c.id,
      code: c.code,
      name: c.name,
      gaugeRatio: ratio ?? 10,
      reason: ratio === null ? null : body.reason,
    };
  });
}
