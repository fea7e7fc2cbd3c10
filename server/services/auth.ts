import { randomUUID } from 'node:crypto';
import jwt from 'jsonwebtoken';
import type { Sequelize } from 'sequelize';
import type { ChangePasswordBody, LoginBody, PreferencesBody } from '../../shared/schemas/auth.js';
import { recordAudit, type Ctx } from '../audit.js';
import { AppError, invalid, notFound } from '../errors.js';
import { JWT_ALGORITHM } from '../middleware/authenticate.js';
import { Session, User } from '../models/index.js';
import { burnTime, checkPassword, hashPassword } from './passwords.js';
import { checkSecondFactor, secondFactorRequiredFor } from './second-factor.js';
import { endAllSessions } from './sessions.js';

export const GENERIC_SIGN_IN_FAILURE = 'That e-mail and password do not match an active account.';

export type SignIn = { token: string; user: User; expiresAt: Date; enrolOnly: boolean };

/**
 * Checks the password, then the second factor when the person has one, and opens a session. Every
 * password failure looks the same to the caller. An admin without a second factor gets a session
 * that can only enrol one (server/http/api.ts refuses everything else to it).
 */
export async function signIn(
  sequelize: Sequelize,
  body: LoginBody,
  opts: {
    secret: string;
    hours: number;
    ip: string | null;
    userAgent: string | null;
    requestId: string;
  },
): Promise<SignIn> {
  const user = await User.findOne({ where: { email: body.email } });
  const ok = user ? await checkPassword(body.password, user.passwordHash) : await burnTime(body.password);
  if (!user || !ok || !user.active) throw new AppError('sign_in_failed', GENERIC_SIGN_IN_FAILURE);
  if (user.totpSecret && !body.code) {
    throw new AppError('code_required', 'Enter the 6-digit code from your authenticator app.', {
      code: 'Enter the code your authenticator app shows now.',
    });
  }

  const expiresAt = new Date(Date.now() + opts.hours * 3600_000);
  const sessionId = randomUUID();
  const enrolOnly = secondFactorRequiredFor(user.role) && !user.totpSecret;
  const ctx: Ctx = { actor: { id: user.id, role: user.role, name: user.name }, requestId: opts.requestId };
  await sequelize.transaction(async (transaction) => {
    if (user.totpSecret) await checkSecondFactor(ctx, transaction, user.id, body.code!, opts.secret);
    await Session.create(
      {
        id: sessionId,
        userId: user.id,
        tokenVersion: user.tokenVersion,
        ip: opts.ip?.slice(0, 64) ?? null,
        userAgent: opts.userAgent?.slice(0, 300) ?? null,
        expiresAt,
        revokedAt: null,
        enrolOnly,
      },
      { transaction },
    );
    await user.update({ lastSignInAt: new Date() }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'user.signed_in',
      entity: 'user',
      entityId: user.id,
      after: { sessionId, secondFactor: user.totpSecret ? 'checked' : enrolOnly ? 'to_enrol' : 'none' },
    });
  });
  const token = jwt.sign({ sid: sessionId, tv: user.tokenVersion }, opts.secret, {
    algorithm: JWT_ALGORITHM,
    subject: String(user.id),
    expiresIn: Math.floor(opts.hours * 3600),
  });
  return { token, user, expiresAt, enrolOnly };
}

export async function signOut(sequelize: Sequelize, ctx: Ctx, sessionId: string): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    await Session.update({ revokedAt: new Date() }, { where: { id: sessionId, revokedAt: null }, transaction });
    if (ctx.actor) {
      await recordAudit(ctx, transaction, {
        action: 'user.signed_out',
        entity: 'user',
        entityId: ctx.actor.id,
        after: { sessionId },
      });
    }
  });
}

export async function changeOwnPassword(sequelize: Sequelize, ctx: Ctx, userId: number, body: ChangePasswordBody) {
  if (body.currentPassword === body.newPassword) {
    throw invalid('Choose a new password different from the current one.', { newPassword: 'Same as the current one.' });
  }
  const passwordHash = await hashPassword(body.newPassword);
  await sequelize.transaction(async (transaction) => {
    // locked, so two changes at once cannot both pass the check against the old password
    const user = await User.findByPk(userId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user || !(await checkPassword(body.currentPassword, user.passwordHash))) {
      throw new AppError('wrong_password', 'Your current password is not right.', {
        currentPassword: 'Not right.',
      });
    }
    await user.update({ passwordHash }, { transaction });
    await endAllSessions(user, transaction);
    await recordAudit(ctx, transaction, { action: 'user.password_changed', entity: 'user', entityId: user.id });
  });
}

/** Your own language and unit system: what the floor screens speak and which unit a reading starts in. */
export async function setOwnPreferences(sequelize: Sequelize, ctx: Ctx, userId: number, body: PreferencesBody) {
  await sequelize.transaction(async (transaction) => {
    const user = await User.findByPk(userId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw notFound('That person');
    const before = { language: user.language, unitSystem: user.unitSystem };
    await user.update(body, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'user.preferences_changed',
      entity: 'user',
      entityId: user.id,
      before,
      after: { language: user.language, unitSystem: user.unitSystem },
    });
  });
}
