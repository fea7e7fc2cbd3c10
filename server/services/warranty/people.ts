import { Op, type Transaction } from 'sequelize';
import type { Role } from '../../../shared/roles.js';
import { User } from '../../models/index.js';

/** The e-mail addresses of everyone active in these roles, read in the caller's transaction. */
export async function addressesOf(roles: Role[], transaction: Transaction): Promise<string[]> {
  const people = await User.findAll({
    where: { role: { [Op.in]: roles }, active: true },
    attributes: ['email'],
    order: [['id', 'ASC']],
    transaction,
  });
  return people.map((p) => p.email);
}

/** Names of people by id, for presenters (one query whatever the count). */
export async function namesOf(ids: (number | null | undefined)[], transaction?: Transaction) {
  const wanted = [...new Set(ids.filter((x): x is number => typeof x === 'number'))];
  const rows = wanted.length
    ? await User.findAll({ where: { id: { [Op.in]: wanted } }, attributes: ['id', 'name'], transaction })
    : [];
  const byId = new Map(rows.map((u) => [u.id, u.name]));
  return (id: number | null | undefined) => (id ? (byId.get(id) ?? null) : null);
}
