import { randomUUID } from 'node:crypto';
import jwt from 'jsonwebtoken';
import type { Sequelize } from 'sequelize';
import type { ChangePasswordBody, LoginBody } from '../../shared/schemas/auth.js';
import { recordAudit, type Ctx } from '../audit.js';
import { AppError, invalid } from '../errors.js';
import { JWT_ALGORITHM } from '../middleware/authenticate.js';
import { Session, User } from '../models/index.js';
import { burnTime, checkPassword, hashPassword } from './passwords.js';

export const GENERIC_SIGN_IN_FAILURE = 'That e-mail and password do not match an active account.';

export type SignIn = { token: string; user: User; expiresAt: Date };

/** Checks the password and opens a session. Every failure looks the same to the caller. */
export async function signIn(
  sequelize: Sequelize,
  body: LoginBody,
  opts: { secret: string; hours: number; ip: string | null; userAgent: string | null; requestId: string },
): Promise<SignIn> {
  const user = await User.findOne({ where: { email: body.email } });
  const ok = user ? await checkPassword(body.password, user.passwordHash) : await burnTime(body.password);
  if (!user || !ok || !user.active) throw new AppError(401, 'sign_in_failed', GENERIC_SIGN_IN_FAILURE);

  const expiresAt = new Date(Date.now() + opts.hours * 3600_000);
  const sessionId = randomUUID();
  await sequelize.transaction(async (transaction) => {
    await Session.create(
      {
        id: sessionId,
        userId: user.id,
        tokenVersion: user.tokenVersion,
        ip: opts.ip?.slice(0, 64) ?? null,
        userAgent: opts.userAgent?.slice(0, 300) ?? null,
        expiresAt,
        revokedAt: null,
      },
      { transaction },
    );
    await user.update({ lastSignInAt: new Date() }, { transaction });
    await recordAudit({ actor: { id: user.id, role: user.role }, requestId: opts.requestId }, transaction, {
      action: 'user.signed_in',
      entity: 'user',
      entityId: user.id,
      after: { sessionId },
    });
  });
  const token = jwt.sign({ sid: sessionId, tv: user.tokenVersion }, opts.secret, {
    algorithm: JWT_ALGORITHM,
    subject: String(user.id),
    expiresIn: Math.floor(opts.hours * 3600),
  });
  return { token, user, expiresAt };
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

/** Ends every session of a user: bumps the token version and revokes the session rows. */
export async function endAllSessions(user: User, transaction: import('sequelize').Transaction) {
  await user.increment('tokenVersion', { transaction });
  await Session.update({ revokedAt: new Date() }, { where: { userId: user.id, revokedAt: null }, transaction });
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
      throw invalid('Your current password is not right.', { currentPassword: 'Not right.' });
    }
    await user.update({ passwordHash }, { transaction });
    await endAllSessions(user, transaction);
    await recordAudit(ctx, transaction, { action: 'user.password_changed', entity: 'user', entityId: user.id });
  });
}
