import type { Sequelize, Transaction } from 'sequelize';
import type { PartKindBody, PartKindJson } from '../../../shared/schemas/process.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { conflict, invalid, notFound } from '../../errors.js';
import { PartKindRow } from '../../models/index.js';
import { taken } from './taken.js';

/** The plant's part kinds: the built-in ones stay in use and serialized; others may be retired. */

export const presentPartKind = (k: PartKindRow): PartKindJson => ({
  code: k.code,
  name: k.name,
  serialized: k.serialized,
  builtIn: k.builtIn,
  retired: !!k.retiredAt,
});

export async function listPartKinds() {
  const rows = await PartKindRow.findAll({
    order: [
      ['sortOrder', 'ASC'],
      ['code', 'ASC'],
    ],
  });
  return rows.map(presentPartKind);
}

export async function partKindInUse(code: string, transaction: Transaction) {
  const kind = await PartKindRow.findByPk(code, { transaction });
  if (!kind || kind.retiredAt) {
    throw invalid(`There is no part kind "${code}" in use.`, { partKind: 'Unknown or retired part kind.' });
  }
  return kind;
}

export async function createPartKind(sequelize: Sequelize, ctx: Ctx, body: PartKindBody) {
  return sequelize.transaction(async (transaction) => {
    const kind = await PartKindRow.create(body, { transaction }).catch(taken(`The part kind code ${body.code}`));
    await recordAudit(ctx, transaction, {
      action: 'part_kind.created',
      entity: 'part_kind',
      entityId: kind.code,
      after: presentPartKind(kind),
    });
    return presentPartKind(kind);
  });
}

export async function updatePartKind(
  sequelize: Sequelize,
  ctx: Ctx,
  code: string,
  body: { name?: string; serialized?: boolean; retired?: boolean },
) {
  return sequelize.transaction(async (transaction) => {
    const kind = await PartKindRow.findByPk(code, { transaction, lock: transaction.LOCK.UPDATE });
    if (!kind) throw notFound('That part kind');
    if (kind.builtIn && (body.retired || body.serialized === false)) {
      throw conflict(`${kind.name} is one the build and teardown work with: it stays in use and serialized.`);
    }
    const before = presentPartKind(kind);
    const { retired, ...rest } = body;
    await kind.update(
      { ...rest, ...(retired === undefined ? {} : { retiredAt: retired ? (kind.retiredAt ?? new Date()) : null }) },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: retired ? 'part_kind.retired' : 'part_kind.updated',
      entity: 'part_kind',
      entityId: kind.code,
      before,
      after: presentPartKind(kind),
    });
    return presentPartKind(kind);
  });
}
