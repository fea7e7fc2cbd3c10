import { UniqueConstraintError, type Sequelize } from 'sequelize';
import type { CreatePartyBody } from '../../shared/schemas/reference.js';
import { recordAudit, type Ctx } from '../audit.js';
import { conflict } from '../errors.js';
import { Customer, Supplier } from '../models/index.js';

const WORD = { customer: 'customer', supplier: 'supplier' } as const;

/**
 * Adds a customer or a supplier with its audit event in the same transaction. Codes are unique
 * per list; a code already taken is refused (also when two people add it at once).
 */
export async function createParty(
  sequelize: Sequelize,
  ctx: Ctx,
  kind: 'customer' | 'supplier',
  body: CreatePartyBody,
) {
  const Model = kind === 'customer' ? Customer : Supplier;
  const email = body.email ? body.email : null;
  try {
    return await sequelize.transaction(async (transaction) => {
      if (await Model.findOne({ where: { code: body.code }, transaction })) {
        throw conflict(`There is already a ${WORD[kind]} with code ${body.code}.`);
      }
      const row = await Model.create({ code: body.code, name: body.name, email }, { transaction });
      const after = { code: row.code, name: row.name, email: row.email };
      await recordAudit(
        ctx,
        transaction,
        kind === 'customer'
          ? { action: 'customer.created', entity: 'customer', entityId: row.id, after }
          : { action: 'supplier.created', entity: 'supplier', entityId: row.id, after },
      );
      return { id: row.id, ...after };
    });
  } catch (e) {
    if (e instanceof UniqueConstraintError) throw conflict(`There is already a ${WORD[kind]} with code ${body.code}.`);
    throw e;
  }
}
