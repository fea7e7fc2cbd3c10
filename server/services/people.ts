import { Op, type Sequelize, type WhereOptions } from 'sequelize';
import type { Person } from '../../shared/schemas/people.js';
import type { CreatePersonBody, UpdatePersonBody } from '../../shared/schemas/people.js';
import type { Role } from '../../shared/roles.js';
import { recordAudit, type Ctx } from '../audit.js';
import { conflict, notFound } from '../errors.js';
import { User } from '../models/index.js';
import { endAllSessions } from './sessions.js';
import { hashPassword } from './passwords.js';

export function presentPerson(u: User): Person {
  return {
    id: u.id,
    email: u.email,
    name: u.name,
    role: u.role,
    active: u.active,
    secondFactor: Boolean(u.totpSecret),
    lastSignInAt: u.lastSignInAt?.toISOString() ?? null,
    createdAt: u.createdAt.toISOString(),
  };
}

/** What the audit trail keeps of a person: never the password hash. */
export const personSnapshot = (u: User) => ({ email: u.email, name: u.name, role: u.role, active: u.active });

export async function listPeople(q: {
  page: number;
  pageSize: number;
  q?: string;
  role?: Role;
  active?: 'true' | 'false';
}) {
  const where: WhereOptions<User> = {};
  if (q.role) Object.assign(where, { role: q.role });
  if (q.active) Object.assign(where, { active: q.active === 'true' });
  if (q.q) {
    const like = `%${q.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    Object.assign(where, { [Op.or]: [{ name: { [Op.iLike]: like } }, { email: { [Op.iLike]: like } }] });
  }
  const { rows, count } = await User.findAndCountAll({
    where,
    order: [['name', 'ASC']],
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
  });
  return { rows: rows.map(presentPerson), total: count, page: q.page, pageSize: q.pageSize };
}

export async function createPerson(sequelize: Sequelize, ctx: Ctx, body: CreatePersonBody): Promise<Person> {
  const passwordHash = await hashPassword(body.password);
  return sequelize.transaction(async (transaction) => {
    const user = await User.create(
      { email: body.email, name: body.name, role: body.role, passwordHash, lastSignInAt: null },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'user.created',
      entity: 'user',
      entityId: user.id,
      after: personSnapshot(user),
    });
    return presentPerson(user);
  });
}

export async function updatePerson(
  sequelize: Sequelize,
  ctx: Ctx,
  id: number,
  body: UpdatePersonBody,
): Promise<Person> {
  return sequelize.transaction(async (transaction) => {
    const user = await User.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw notFound('That person');
    if (ctx.actor?.id === id && (body.active === false || (body.role && body.role !== user.role))) {
      throw conflict('You cannot deactivate yourself or change your own role; ask another administrator.');
    }
    const before = personSnapshot(user);
    const endSessions = body.active === false && user.active;
    await user.update(body, { transaction });
    if (endSessions) await endAllSessions(user, transaction);
    await recordAudit(ctx, transaction, {
      action: body.active === false ? 'user.deactivated' : 'user.updated',
      entity: 'user',
      entityId: user.id,
      before,
      after: personSnapshot(user),
    });
    return presentPerson(user);
  });
}

export async function resetPassword(sequelize: Sequelize, ctx: Ctx, id: number, password: string): Promise<void> {
  const passwordHash = await hashPassword(password);
  await sequelize.transaction(async (transaction) => {
    const user = await User.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw notFound('That person');
    await user.update({ passwordHash }, { transaction });
    await endAllSessions(user, transaction);
    await recordAudit(ctx, transaction, { action: 'user.password_reset', entity: 'user', entityId: user.id });
  });
}
