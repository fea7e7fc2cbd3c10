import type { Sequelize } from 'sequelize';
import type { EnrolTabletBody, TabletJson, TabletResultBody } from '../../shared/schemas/tablets.js';
import { can } from '../../shared/permissions.js';
import { auditedUpdate, recordAudit, type Ctx } from '../audit.js';
import { AppError, conflict, invalid, notFound, tooMany } from '../errors.js';
import { FailureLimiter } from '../http/limits.js';
import type { AuthedTablet } from '../middleware/tablet.js';
import { Stage, Station, StationTablet, User } from '../models/index.js';
import { burnTime, checkPassword, hashPassword } from './passwords.js';
import { submitResult } from './results/index.js';

async function present(t: StationTablet): Promise<TabletJson> {
  const station = (await Station.findByPk(t.stationId))!;
  const stage = station.stageId ? await Stage.findByPk(station.stageId) : null;
  const by = await User.findByPk(t.enrolledById, { attributes: ['name'] });
  return {
    id: t.id,
    label: t.label,
    station: {
      code: station.code,
      name: station.name,
      location: station.location,
      stage: stage ? { code: stage.code, name: stage.name } : null,
    },
    enrolledBy: by?.name ?? '',
    enrolledAt: t.createdAt.toISOString(),
    retiredAt: t.retiredAt?.toISOString() ?? null,
  };
}

export async function enrolTablet(sequelize: Sequelize, ctx: Ctx, body: EnrolTabletBody): Promise<TabletJson> {
  const tablet = await sequelize.transaction(async (transaction) => {
    const station = await Station.findOne({ where: { code: body.station.toUpperCase() }, transaction });
    if (!station) throw invalid('Choose a station from the list.', { station: `No station ${body.station}.` });
    if (!station.active) throw conflict(`${station.code} is out of service: return it to service first.`);
    if (!station.stageId) throw conflict(`${station.code} records no stage: set its stage first.`);
    const t = await StationTablet.create(
      { stationId: station.id, label: body.label, enrolledById: ctx.actor!.id },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'tablet.enrolled',
      entity: 'station_tablet',
      entityId: t.id,
      after: { station: station.code, label: t.label },
    });
    return t;
  });
  return present(tablet);
}

export async function listTablets(): Promise<TabletJson[]> {
  const rows = await StationTablet.findAll({ order: [['id', 'DESC']], limit: 500 });
  return Promise.all(rows.map(present));
}

export async function retireTablet(sequelize: Sequelize, ctx: Ctx, id: number): Promise<TabletJson> {
  const t = await sequelize.transaction(async (transaction) => {
    const row = await StationTablet.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw notFound('That tablet');
    if (row.retiredAt) throw conflict('That tablet was already retired.');
    await row.update({ retiredAt: new Date(), retiredById: ctx.actor!.id }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'tablet.retired',
      entity: 'station_tablet',
      entityId: row.id,
      before: { retired: false },
      after: { retired: true },
    });
    return row;
  });
  return present(t);
}

export async function thisTablet(tablet: AuthedTablet): Promise<TabletJson> {
  return present((await StationTablet.findByPk(tablet.id))!);
}

/** Sets or clears a person's badge (an admin's task; the badge itself is no secret). */
export async function setBadge(sequelize: Sequelize, ctx: Ctx, userId: number, badge: string | null) {
  await sequelize.transaction(async (transaction) => {
    const user = await User.findByPk(userId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw notFound('That person');
    const value = badge ? badge.toUpperCase() : null;
    const taken = value ? await User.findOne({ where: { badge: value }, transaction }) : null;
    if (taken && taken.id !== user.id) {
      throw conflict(`Badge ${value} is already ${taken.name}'s.`, { reason: 'badge_taken' });
    }
    await auditedUpdate(
      ctx,
      transaction,
      user,
      { badge: value },
      { action: 'user.badge_set', entity: 'user', entityId: user.id },
    );
  });
}

/** Sets one's own PIN, with one's password typed again. The PIN is hashed as passwords are. */
export async function setOwnPin(sequelize: Sequelize, ctx: Ctx, pin: string, password: string) {
  const pinHash = await hashPassword(pin);
  await sequelize.transaction(async (transaction) => {
    const user = (await User.findByPk(ctx.actor!.id, { transaction, lock: transaction.LOCK.UPDATE }))!;
    if (!(await checkPassword(password, user.passwordHash))) {
      throw new AppError('wrong_password', 'That is not your password. Your PIN was not changed.', {
        password: 'That is not your password.',
      });
    }
    await user.update({ pinHash, pinSetAt: new Date() }, { transaction });
    // never the PIN or its hash in the trail
    await recordAudit(ctx, transaction, { action: 'user.pin_set', entity: 'user', entityId: user.id });
  });
}

/** Wrong PINs: five per badge, or twenty per tablet, in 15 minutes, then that badge or tablet waits. */
export const PIN_LIMIT_PER_BADGE = 5;
export const PIN_LIMIT_PER_TABLET = 20;
export const PIN_WINDOW_MIN = 15;

export type PinLimits = { badge: FailureLimiter; tablet: FailureLimiter };
export const pinLimits = (): PinLimits => ({
  badge: new FailureLimiter(PIN_LIMIT_PER_BADGE, PIN_WINDOW_MIN * 60_000),
  tablet: new FailureLimiter(PIN_LIMIT_PER_TABLET, PIN_WINDOW_MIN * 60_000),
});

const REFUSED = 'That badge and PIN do not match anyone who may record here. Nothing was recorded.';

/**
 * The person a badge and PIN name, or a refusal that says the same whatever was wrong (unknown
 * badge, wrong PIN, no PIN set, inactive, a role that does not record). Checked against both
 * limits first; a failure counts after it, so right PINs never count.
 */
export async function identify(limits: PinLimits, tablet: AuthedTablet, badge: string, pin: string) {
  const badgeKey = `badge:${badge.toUpperCase()}`;
  const tabletKey = `tablet:${tablet.id}`;
  const wait = Math.max(limits.badge.lockedFor(badgeKey), limits.tablet.lockedFor(tabletKey));
  if (wait > 0) {
    throw tooMany(
      `Too many wrong PINs. Wait ${Math.ceil(wait / 60)} minutes, or ask a supervisor. Nothing was recorded.`,
    );
  }
  const user = await User.findOne({ where: { badge: badge.toUpperCase() } });
  const ok =
    user && user.active && user.pinHash && can(user.role, 'results.record')
      ? await checkPassword(pin, user.pinHash)
      : (await burnTime(pin), false);
  if (!ok || !user) {
    limits.badge.fail(badgeKey);
    limits.tablet.fail(tabletKey);
    throw new AppError('pin_refused', REFUSED, { pin: 'Badge and PIN do not match.' });
  }
  return user;
}

/** A result from a shared tablet: recorded under the person the badge and PIN name, with the tablet kept. */
export async function submitTabletResult(
  sequelize: Sequelize,
  limits: PinLimits,
  tablet: AuthedTablet,
  requestId: string | null,
  body: TabletResultBody,
) {
  if (body.station.toUpperCase() !== tablet.station.code) {
    throw invalid(`This tablet records ${tablet.station.code} only.`, {
      station: `This tablet is enrolled to ${tablet.station.code}.`,
    });
  }
  const person = await identify(limits, tablet, body.badge, body.pin);
  const { badge: _badge, pin: _pin, ...result } = body;
  const ctx: Ctx = { actor: { id: person.id, role: person.role, name: person.name }, requestId };
  return submitResult(sequelize, ctx, result, {
    path: '/api/tablet/results',
    tablet: { id: tablet.id, label: tablet.label },
  });
}
