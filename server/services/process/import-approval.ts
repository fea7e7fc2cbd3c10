import type { Sequelize, Transaction } from 'sequelize';
import type { ProcessDocument } from '../../../shared/schemas/process-document.js';
import type { ApproveChangeBody } from '../../../shared/schemas/process.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { forbidden, invalid } from '../../errors.js';
import { ProcessImport, Signature, type User } from '../../models/index.js';
import { applyDocument } from './import-apply.js';
import { planFor, refuse } from './import-plan.js';
import { lockedDraft, presentImport } from './imports.js';
import { settleRouteVersions } from './route-clock.js';
import { signWithPassword } from '../signatures.js';

/** Approves a draft import with the approver's signature and applies it, all or nothing. */
export async function approveImport(sequelize: Sequelize, ctx: Ctx, id: number, input: ApproveChangeBody) {
  await settleRouteVersions(sequelize);
  return sequelize.transaction(async (transaction) => {
    await sequelize.query("SELECT pg_advisory_xact_lock(hashtext('process_import'))", { transaction });
    const imp = await lockedDraft(id, transaction);
    if (imp.createdById === ctx.actor!.id) {
      throw forbidden('You imported this document: someone else must approve it.');
    }
    const now = new Date();
    const requested = input.effectiveFrom ? new Date(input.effectiveFrom) : now;
    if (requested.getTime() < now.getTime() - 60_000) {
      throw invalid('An import cannot take effect in the past: parts already on a route keep their version.', {
        effectiveFrom: 'Choose now or a later time.',
      });
    }
    const effective = requested < now ? now : requested;
    // the plant may have changed since the draft: checked again, and refused whole if it no longer fits
    const { problems, plan } = await planFor(imp.document, transaction);
    if (problems.length) throw refuse(problems, 'conflict');
    const meaning = `Approved process import ${imp.id}`;
    const { user } = await signWithPassword(ctx, transaction, {
      entity: 'process_import',
      entityId: String(imp.id),
      meaning,
      reason: input.reason,
      password: input.password,
      refused: 'the import was not approved.',
    });
    const applied = await applyDocument(transaction, imp.document, plan, {
      authorId: imp.createdById,
      approverId: user.id,
      reason: input.reason,
      effective,
      now,
    });
    await imp.update(
      {
        status: 'approved',
        plan,
        approvedById: user.id,
        approvedAt: now,
        approvalReason: input.reason,
        effectiveFrom: effective,
      },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'process_import.approved',
      entity: 'process_import',
      entityId: imp.id,
      before: { status: 'draft' },
      after: {
        status: 'approved',
        plan,
        routes: applied.routes,
        effectiveFrom: effective.toISOString(),
        signature: { printedName: user.name, meaning, reason: input.reason, signedAt: now.toISOString() },
      },
    });
    for (const r of applied.routes) {
      await recordAudit(ctx, transaction, {
        action: 'route.approved',
        entity: 'route',
        entityId: r.id,
        after: { ...r, byImport: imp.id, effectiveFrom: effective.toISOString() },
      });
    }
    return presentImport(imp, transaction);
  });
}

/**
 * A document imported and approved at once, in the caller's transaction: the demo seed's way in,
 * through the same check, plan and apply as an approved import. The approval is signed by `approver`
 * at `now` without a password (nobody is at the keyboard when the demo is seeded); the signature's
 * meaning says it came with the seed.
 */
export async function importApprovedBySeed(
  ctx: Ctx,
  transaction: Transaction,
  doc: ProcessDocument,
  by: { author: User; approver: User; reason: string; now: Date },
) {
  const { problems, plan } = await planFor(doc, transaction);
  if (problems.length) {
    throw new Error(`the seed's process document: ${problems.map((p) => `${p.path}: ${p.message}`).join('; ')}`);
  }
  const imp = await ProcessImport.create(
    { document: doc, plan, note: by.reason, createdById: by.author.id },
    { transaction },
  );
  const meaning = `Approved process import ${imp.id} (demo seed)`;
  await Signature.create(
    {
      userId: by.approver.id,
      printedName: by.approver.name,
      meaning,
      reason: by.reason,
      entity: 'process_import',
      entityId: String(imp.id),
      signedAt: by.now,
    },
    { transaction },
  );
  const applied = await applyDocument(transaction, doc, plan, {
    authorId: by.author.id,
    approverId: by.approver.id,
    reason: by.reason,
    effective: by.now,
    now: by.now,
  });
  await imp.update(
    {
      status: 'approved',
      approvedById: by.approver.id,
      approvedAt: by.now,
      approvalReason: by.reason,
      effectiveFrom: by.now,
    },
    { transaction },
  );
  await recordAudit(ctx, transaction, {
    action: 'process_import.approved',
    entity: 'process_import',
    entityId: imp.id,
    after: {
      status: 'approved',
      plan,
      routes: applied.routes,
      effectiveFrom: by.now.toISOString(),
      signature: { printedName: by.approver.name, meaning, reason: by.reason, signedAt: by.now.toISOString() },
    },
  });
  for (const r of applied.routes) {
    await recordAudit(ctx, transaction, {
      action: 'route.approved',
      entity: 'route',
      entityId: r.id,
      after: { ...r, byImport: imp.id, effectiveFrom: by.now.toISOString() },
    });
  }
  return { importId: imp.id, plan, routes: applied.routes };
}
