import QRCode from 'qrcode';
import { Op, type Sequelize, type Transaction } from 'sequelize';
import type { Role } from '../../shared/roles.js';
import type { SecondFactorStart, SecondFactorStatus } from '../../shared/schemas/auth.js';
import { recordAudit, type Ctx } from '../audit.js';
import {
  checkTotp,
  hashRecoveryCode,
  looksLikeRecoveryCode,
  newRecoveryCodes,
  newTotpSecret,
  openSecret,
  sealSecret,
  totpUri,
} from '../auth/totp.js';
import { AppError, conflict, notFound } from '../errors.js';
import { RecoveryCode, Session, User } from '../models/index.js';
import { endAllSessions } from './sessions.js';
import { checkPassword } from './passwords.js';

/** OWASP ASVS 4.0.3 V4.3.1: administrative interfaces use multi-factor authentication. */
export const secondFactorRequiredFor = (role: Role) => role === 'admin';

const CODE_REFUSED =
  'That code is not right. Check that the phone sets its clock automatically, or use one of your recovery codes.';

export async function secondFactorStatus(userId: number): Promise<SecondFactorStatus> {
  const user = await User.findByPk(userId, { attributes: ['id', 'role', 'totpSecret'] });
  if (!user) throw notFound('That person');
  const left = user.totpSecret ? await RecoveryCode.count({ where: { userId, usedAt: null } }) : 0;
  return { enrolled: Boolean(user.totpSecret), required: secondFactorRequiredFor(user.role), recoveryCodesLeft: left };
}

/**
 * Checks a code at sign-in, in the sign-in's transaction: an authenticator code newer than the last
 * one accepted, or an unused recovery code (then used up). Anything else is 401 `code_refused`.
 */
export async function checkSecondFactor(
  ctx: Ctx,
  transaction: Transaction,
  userId: number,
  code: string,
  serverSecret: string,
): Promise<void> {
  const user = (await User.findByPk(userId, { transaction, lock: transaction.LOCK.UPDATE }))!;
  if (looksLikeRecoveryCode(code)) {
    const [used] = await RecoveryCode.update(
      { usedAt: new Date() },
      { where: { userId, codeHash: hashRecoveryCode(code), usedAt: null }, transaction },
    );
    if (used !== 1) throw new AppError('code_refused', CODE_REFUSED, { code: 'Not right.' });
    await recordAudit(ctx, transaction, { action: 'user.recovery_code_used', entity: 'user', entityId: userId });
    return;
  }
  const step = checkTotp(openSecret(user.totpSecret!, serverSecret), code, { lastStep: user.totpLastStep });
  if (step === null) throw new AppError('code_refused', CODE_REFUSED, { code: 'Not right.' });
  await user.update({ totpLastStep: step }, { transaction });
}

/** A new secret to scan, kept as pending until a code from it confirms the phone has it. */
export async function startEnrolment(
  sequelize: Sequelize,
  ctx: Ctx,
  userId: number,
  serverSecret: string,
): Promise<SecondFactorStart> {
  return sequelize.transaction(async (transaction) => {
    const user = (await User.findByPk(userId, { transaction, lock: transaction.LOCK.UPDATE }))!;
    if (user.totpSecret) {
      throw conflict('You already have a second factor. To move it to a new phone, remove it first.');
    }
    const secret = newTotpSecret();
    await user.update({ totpPendingSecret: sealSecret(secret, serverSecret) }, { transaction });
    await recordAudit(ctx, transaction, { action: 'user.second_factor_started', entity: 'user', entityId: userId });
    const uri = totpUri(secret, user.email);
    const qrSvg = await QRCode.toString(uri, { type: 'svg', errorCorrectionLevel: 'M', margin: 2 });
    return { secret, uri, qrSvg };
  });
}

/** The first code from the phone: the secret becomes the person's, with ten recovery codes. */
export async function confirmEnrolment(
  sequelize: Sequelize,
  ctx: Ctx,
  userId: number,
  sessionId: string,
  code: string,
  serverSecret: string,
): Promise<{ recoveryCodes: string[] }> {
  return sequelize.transaction(async (transaction) => {
    const user = (await User.findByPk(userId, { transaction, lock: transaction.LOCK.UPDATE }))!;
    if (user.totpSecret) throw conflict('You already have a second factor.');
    if (!user.totpPendingSecret) throw conflict('Start the set-up again: no code is waiting to be confirmed.');
    const step = checkTotp(openSecret(user.totpPendingSecret, serverSecret), code, { lastStep: null });
    if (step === null) {
      // a wrong code while setting up is a field to correct, not a refused sign-in
      throw new AppError('invalid', 'That code is not right. Scan the QR code again and enter the code shown now.', {
        code: 'Not right.',
      });
    }
    await user.update(
      { totpSecret: user.totpPendingSecret, totpPendingSecret: null, totpEnrolledAt: new Date(), totpLastStep: step },
      { transaction },
    );
    await RecoveryCode.destroy({ where: { userId }, transaction });
    const recoveryCodes = newRecoveryCodes();
    await RecoveryCode.bulkCreate(
      recoveryCodes.map((c) => ({ userId, codeHash: hashRecoveryCode(c), usedAt: null })),
      { transaction },
    );
    // this session becomes a full one; another still waiting to enrol has nothing left to do
    await Session.update({ enrolOnly: false }, { where: { id: sessionId }, transaction });
    await Session.update(
      { revokedAt: new Date() },
      { where: { userId, enrolOnly: true, revokedAt: null, id: { [Op.ne]: sessionId } }, transaction },
    );
    await recordAudit(ctx, transaction, { action: 'user.second_factor_enrolled', entity: 'user', entityId: userId });
    return { recoveryCodes };
  });
}

/** Someone for whom it is optional turns their second factor off, with their password. */
export async function removeOwnSecondFactor(sequelize: Sequelize, ctx: Ctx, userId: number, password: string) {
  await sequelize.transaction(async (transaction) => {
    const user = (await User.findByPk(userId, { transaction, lock: transaction.LOCK.UPDATE }))!;
    if (secondFactorRequiredFor(user.role)) {
      throw conflict('Administrators keep a second factor. Another administrator can reset it if the phone is lost.');
    }
    if (!(await checkPassword(password, user.passwordHash))) {
      throw new AppError('wrong_password', 'Your password is not right.', { password: 'Not right.' });
    }
    await clearFactor(user, transaction);
    await recordAudit(ctx, transaction, { action: 'user.second_factor_removed', entity: 'user', entityId: userId });
  });
}

/** An admin clears someone's second factor (a lost phone); their sessions end with it. */
export async function resetSecondFactor(sequelize: Sequelize, ctx: Ctx, userId: number) {
  await sequelize.transaction(async (transaction) => {
    const user = await User.findByPk(userId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw notFound('That person');
    if (!user.totpSecret && !user.totpPendingSecret) throw conflict(`${user.name} has no second factor to reset.`);
    await clearFactor(user, transaction);
    await endAllSessions(user, transaction);
    await recordAudit(ctx, transaction, { action: 'user.second_factor_reset', entity: 'user', entityId: userId });
  });
}

async function clearFactor(user: User, transaction: Transaction) {
  await user.update(
    { totpSecret: null, totpPendingSecret: null, totpEnrolledAt: null, totpLastStep: null },
    { transaction },
  );
  // recovery codes are credentials, not records: they go with the factor (the audit event stays)
  await RecoveryCode.destroy({ where: { userId: user.id }, transaction });
}
