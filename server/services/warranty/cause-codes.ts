import type { Sequelize } from 'sequelize';
import type { CauseCodeJson } from '../../../shared/schemas/warranty.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { notFound } from '../../errors.js';
import { CauseCode } from '../../models/index.js';

/**
 * The plant's own cause codes for what a returned unit's teardown found. Codes are never deleted
 * (findings name them); one no longer used is retired. Whether a cause counts as a failure of the
 * product decides what the reliability figures count: "no trouble found" and "installation" do not.
 */

export const presentCause = (c: CauseCode): CauseCodeJson => ({
  code: c.code,
  description: c.description,
  countsAsFailure: c.countsAsFailure,
  active: c.active,
});

export async function listCauseCodes(): Promise<CauseCodeJson[]> {
  return (await CauseCode.findAll({ order: [['code', 'ASC']] })).map(presentCause);
}

export async function createCauseCode(
  sequelize: Sequelize,
  ctx: Ctx,
  body: { code: string; description: string; countsAsFailure: boolean },
): Promise<CauseCodeJson> {
  return sequelize.transaction(async (transaction) => {
    const c = await CauseCode.create(body, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'cause_code.created',
      entity: 'cause_code',
      entityId: c.code,
      after: body,
    });
    return presentCause(c);
  });
}

export async function updateCauseCode(
  sequelize: Sequelize,
  ctx: Ctx,
  code: string,
  body: { description?: string; countsAsFailure?: boolean; active?: boolean },
): Promise<CauseCodeJson> {
  return sequelize.transaction(async (transaction) => {
    const c = await CauseCode.findOne({ where: { code }, transaction, lock: transaction.LOCK.UPDATE });
    if (!c) throw notFound(`Cause code ${code}`);
    const before = presentCause(c);
    await c.update(body, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'cause_code.updated',
      entity: 'cause_code',
      entityId: c.code,
      before,
      after: presentCause(c),
    });
    return presentCause(c);
  });
}
