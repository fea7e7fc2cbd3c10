import { UniqueConstraintError } from 'sequelize';
import { conflict } from '../../errors.js';

/** A unique code already in the table, said as a conflict. */
export const taken = (what: string) => (e: unknown) => {
  if (e instanceof UniqueConstraintError) throw conflict(`${what} is already taken.`);
  throw e;
};
