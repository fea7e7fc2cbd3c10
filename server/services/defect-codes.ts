import { type Sequelize } from 'sequelize';
import { auditedUpdate, recordAudit, type Ctx } from '../audit.js';
import { notFound } from '../errors.js';
import { DefectCode } from '../models/index.js';

// ——— defect codes: the plant's own list ———

export async function listDefectCodes() {
  const rows = await DefectCode.findAll({ order: [['code', 'ASC']] });
  return rows.map((d) => ({ code: d.code, description: d.description, active: d.active }));
}

export async function createDefectCode(sequelize: Sequelize, ctx: Ctx, body: { code: string; description: string }) {
  return sequelize.transaction(async (transaction) => {
    const d = await DefectCode.create({ code: body.code, description: body.description }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'defect_code.created',
      entity: 'defect_code',
      entityId: d.code,
      after: body,
    });
    return { code: d.code, description: d.description, active: d.active };
  });
}

/** Codes are never deleted (NCRs name them); one no longer used is made inactive. */
export async function updateDefectCode(
  sequelize: Sequelize,
  ctx: Ctx,
  code: string,
  body: { description?: string; active?: boolean },
) {
  return sequelize.transaction(async (transaction) => {
    const d = await DefectCode.findOne({ where: { code }, transaction, lock: transaction.LOCK.UPDATE });
    if (!d) throw notFound(`Defect code ${code}`);
    await auditedUpdate(ctx, transaction, d, body, {
      action: 'defect_code.updated',
      entity: 'defect_code',
      entityId: d.code,
    });
    return { code: d.code, description: d.description, active: d.active };
  });
}
