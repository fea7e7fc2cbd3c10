import type { Sequelize, Transaction } from 'sequelize';
import type { ProcessDocument, ProcessImportJson } from '../../../shared/schemas/process-document.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { conflict, notFound } from '../../errors.js';
import { ProcessImport, User } from '../../models/index.js';
import { planFor, refuse } from './import-plan.js';
import { settleRouteVersions } from './route-clock.js';

/**
 * A process document imported as a draft: checked against the plant (every problem by its path,
 * nothing written), kept with what it would add, and applied in one transaction when someone other
 * than its author approves it with a signature, the same change control as a route version. An
 * import adds what the plant lacks and gives each route whose steps differ a new approved version;
 * what the plant already has under the same code is kept as it is.
 */

export async function presentImport(imp: ProcessImport, transaction?: Transaction): Promise<ProcessImportJson> {
  const ids = [imp.createdById, imp.approvedById].filter((x): x is number => !!x);
  const names = new Map(
    (await User.findAll({ where: { id: ids }, attributes: ['id', 'name'], transaction })).map((u) => [u.id, u.name]),
  );
  return {
    id: imp.id,
    status: imp.status,
    note: imp.note,
    plan: imp.plan,
    createdById: imp.createdById,
    createdBy: names.get(imp.createdById) ?? null,
    createdAt: imp.createdAt.toISOString(),
    approvedBy: imp.approvedById ? (names.get(imp.approvedById) ?? null) : null,
    approvedAt: imp.approvedAt?.toISOString() ?? null,
    approvalReason: imp.approvalReason,
    effectiveFrom: imp.effectiveFrom?.toISOString() ?? null,
  };
}

export async function listImports() {
  const rows = await ProcessImport.findAll({ order: [['id', 'DESC']], limit: 100 });
  return Promise.all(rows.map((r) => presentImport(r)));
}

export async function importById(id: number) {
  const imp = await ProcessImport.findByPk(id);
  if (!imp) throw notFound('That import');
  return { ...(await presentImport(imp)), document: imp.document };
}

/** Keeps a checked document as a draft import; a bad one is refused with every problem, nothing kept. */
export async function draftImport(sequelize: Sequelize, ctx: Ctx, doc: ProcessDocument, note: string) {
  await settleRouteVersions(sequelize);
  return sequelize.transaction(async (transaction) => {
    await sequelize.query("SELECT pg_advisory_xact_lock(hashtext('process_import'))", { transaction });
    const { problems, plan } = await planFor(doc, transaction);
    if (problems.length) throw refuse(problems);
    const waiting = await ProcessImport.findOne({ where: { status: 'draft' }, transaction });
    if (waiting) {
      throw conflict(`Import ${waiting.id} is already a draft: approve or discard it first.`, { draftId: waiting.id });
    }
    const imp = await ProcessImport.create({ document: doc, plan, note, createdById: ctx.actor!.id }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'process_import.drafted',
      entity: 'process_import',
      entityId: imp.id,
      after: { plan, note },
    });
    return presentImport(imp, transaction);
  });
}

export async function lockedDraft(id: number, transaction: Transaction) {
  const imp = await ProcessImport.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!imp) throw notFound('That import');
  if (imp.status !== 'draft') throw conflict(`Import ${imp.id} is ${imp.status}, not a draft.`);
  return imp;
}

export async function discardImport(sequelize: Sequelize, ctx: Ctx, id: number) {
  return sequelize.transaction(async (transaction) => {
    const imp = await lockedDraft(id, transaction);
    await imp.update({ status: 'discarded' }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'process_import.discarded',
      entity: 'process_import',
      entityId: imp.id,
      before: { status: 'draft' },
      after: { status: 'discarded' },
    });
    return presentImport(imp, transaction);
  });
}
