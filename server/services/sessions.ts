import { Op, type Sequelize, type Transaction } from 'sequelize';
import type { Role } from '../../shared/roles.js';
import type { OwnSession } from '../../shared/schemas/auth.js';
import { recordAudit, type Ctx } from '../audit.js';
import { idleLimitMs } from '../middleware/authenticate.js';
import { Session, User } from '../models/index.js';

/** A person's sessions still in force (not ended, expired or idle past their role's limit). */
export async function ownSessions(
  userId: number,
  currentId: string,
  idle: { idleMin: number; shiftHours: number },
): Promise<OwnSession[]> {
  const user = (await User.findByPk(userId, { attributes: ['id', 'role', 'tokenVersion'] }))!;
  const since = new Date(Date.now() - idleLimitMs(user.role as Role, idle));
  const rows = await Session.findAll({
    where: {
      userId,
      revokedAt: null,
      tokenVersion: user.tokenVersion,
      expiresAt: { [Op.gt]: new Date() },
      lastSeenAt: { [Op.gt]: since },
    },
    order: [['lastSeenAt', 'DESC']],
  });
  return rows.map((s) => ({
    id: s.id,
    createdAt: s.createdAt.toISOString(),
    lastSeenAt: s.lastSeenAt.toISOString(),
    ip: s.ip,
    userAgent: s.userAgent,
    current: s.id === currentId,
  }));
}

/** "Sign out everywhere else": every other session of this person ends; this one stays. */
export async function endOtherSessions(sequelize: Sequelize, ctx: Ctx, userId: number, currentId: string) {
  return sequelize.transaction(async (transaction) => {
    const [ended] = await Session.update(
      { revokedAt: new Date() },
      { where: { userId, revokedAt: null, id: { [Op.ne]: currentId } }, transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'user.sessions_ended',
      entity: 'user',
      entityId: userId,
      after: { ended, kept: currentId },
    });
    return { ended };
  });
}

/** Ends every session of a user: bumps the token version and revokes the session rows. */
export async function endAllSessions(user: User, transaction: Transaction) {
  await user.increment('tokenVersion', { transaction });
  await Session.update({ revokedAt: new Date() }, { where: { userId: user.id, revokedAt: null }, transaction });
}
