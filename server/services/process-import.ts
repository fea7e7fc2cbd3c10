import type { Sequelize, Transaction } from 'sequelize';
import {
  crossCheck,
  type DocumentProblem,
  type ImportPlan,
  type ProcessDocument,
  type ProcessImportJson,
} from '../../shared/schemas/process-document.js';
import type { ApproveChangeBody } from '../../shared/schemas/process.js';
import { recordAudit, type Ctx } from '../audit.js';
import { AppError, conflict, forbidden, invalid, notFound } from '../errors.js';
import {
  Characteristic,
  DefectCode,
  EngineFamily,
  FamilyCastingNumber,
  PartKindRow,
  ProcessImport,
  Route,
  RouteStage,
  Signature,
  Stage,
  User,
} from '../models/index.js';
import { settleRouteVersions } from './process-routes.js';
import { signWithPassword } from './signatures.js';

/**
 * A process document imported as a draft: checked against the plant (every problem by its path,
 * nothing written), kept with what it would add, and applied in one transaction when someone other
 * than its author approves it with a signature, the same change control as a route version. An
 * import adds what the plant lacks and gives each route whose steps differ a new approved version;
 * what the plant already has under the same code is kept as it is.
 */

type Step = { stage: string; required: boolean; reworkTo: string | null };
const sameSteps = (a: Step[], b: Step[]) =>
  a.length === b.length &&
  a.every((s, i) => s.stage === b[i]!.stage && s.required === b[i]!.required && s.reworkTo === b[i]!.reworkTo);

/** The routes in force now, per `FAMILY part_kind`, as steps of stage codes. */
async function routesInForce(transaction: Transaction) {
  const routes = await Route.findAll({ where: { active: true }, transaction });
  const stages = await Stage.findAll({ attributes: ['id', 'code'], transaction });
  const families = await EngineFamily.findAll({ attributes: ['id', 'code'], transaction });
  const steps = await RouteStage.findAll({
    where: { routeId: routes.map((r) => r.id) },
    order: [['position', 'ASC']],
    transaction,
  });
  const code = new Map(stages.map((s) => [s.id, s.code]));
  const family = new Map(families.map((f) => [f.id, f.code]));
  return new Map(
    routes.map((r) => [
      `${family.get(r.engineFamilyId)} ${r.partKind}`,
      steps
        .filter((s) => s.routeId === r.id)
        .map((s) => ({
          stage: code.get(s.stageId)!,
          required: s.required,
          reworkTo: s.reworkToStageId ? code.get(s.reworkToStageId)! : null,
        })),
    ]),
  );
}

/** Checks a document against the plant as it is now: its problems by path, or what it would change. */
async function planFor(
  doc: ProcessDocument,
  transaction: Transaction,
): Promise<{ problems: DocumentProblem[]; plan: ImportPlan }> {
  // one after another: a transaction is one connection, which runs one query at a time
  const kinds = await PartKindRow.findAll({ transaction });
  const families = await EngineFamily.findAll({ transaction });
  const stages = await Stage.findAll({ transaction });
  const characteristics = await Characteristic.findAll({ attributes: ['stageId', 'code'], transaction });
  const castings = await FamilyCastingNumber.findAll({ transaction });
  const defects = await DefectCode.findAll({ where: { active: true }, attributes: ['code'], transaction });
  const inForce = await routesInForce(transaction);
  const live = <T extends { retiredAt?: Date | null }>(rows: T[]) => rows.filter((r) => !r.retiredAt);
  const problems = crossCheck(doc, {
    partKinds: live(kinds).map((k) => k.code),
    families: families.map((f) => f.code),
    stages: live(stages).map((s) => ({ code: s.code, partKind: s.partKind })),
  });
  // a retired code cannot come back through an import: it is retired, not free
  const retiredKind = new Set(kinds.filter((k) => k.retiredAt).map((k) => k.code));
  doc.partKinds.forEach((k, i) => {
    if (retiredKind.has(k.code))
      problems.push({ path: `partKinds.${i}.code`, message: `Part kind ${k.code} is retired.` });
  });
  const retiredStage = new Set(stages.filter((s) => s.retiredAt).map((s) => s.code));
  doc.stages.forEach((s, i) => {
    if (retiredStage.has(s.code)) problems.push({ path: `stages.${i}.code`, message: `Stage ${s.code} is retired.` });
  });
  const defectCodes = new Set(defects.map((d) => d.code));
  doc.characteristics.forEach((c, i) => {
    if (c.defectCode && !defectCodes.has(c.defectCode)) {
      problems.push({ path: `characteristics.${i}.defectCode`, message: `No defect code ${c.defectCode} in use.` });
    }
  });
  const stageCode = new Map(stages.map((s) => [s.id, s.code]));
  const haveChar = new Set(characteristics.map((c) => `${stageCode.get(c.stageId)}/${c.code}`));
  const familyCode = new Map(families.map((f) => [f.id, f.code]));
  const haveCasting = new Set(castings.map((c) => `${familyCode.get(c.engineFamilyId)} ${c.castingNumber}`));
  const haveKind = new Set(kinds.map((k) => k.code));
  const haveFamily = new Set(families.map((f) => f.code));
  const haveStage = new Set(stages.map((s) => s.code));
  const plan: ImportPlan = {
    partKinds: doc.partKinds.filter((k) => !haveKind.has(k.code)).map((k) => k.code),
    families: doc.families.filter((f) => !haveFamily.has(f.code)).map((f) => f.code),
    stages: doc.stages.filter((s) => !haveStage.has(s.code)).map((s) => s.code),
    characteristics: doc.characteristics.map((c) => `${c.stage}/${c.code}`).filter((k) => !haveChar.has(k)),
    routes: doc.routes
      .filter((r) => {
        const now = inForce.get(`${r.family} ${r.partKind}`);
        const steps = r.steps.map((s) => ({ stage: s.stage, required: s.required, reworkTo: s.reworkTo ?? null }));
        return !now || !sameSteps(now, steps);
      })
      .map((r) => `${r.family} ${r.partKind}`),
    castingNumbers: doc.castingNumbers.map((c) => `${c.family} ${c.castingNumber}`).filter((k) => !haveCasting.has(k)),
    kept: 0,
  };
  const total =
    doc.partKinds.length +
    doc.families.length +
    doc.stages.length +
    doc.characteristics.length +
    doc.routes.length +
    doc.castingNumbers.length;
  plan.kept =
    total -
    (plan.partKinds.length +
      plan.families.length +
      plan.stages.length +
      plan.characteristics.length +
      plan.routes.length +
      plan.castingNumbers.length);
  return { problems, plan };
}

const refuse = (problems: DocumentProblem[], code: 'invalid' | 'conflict' = 'invalid') =>
  new AppError(
    code,
    `The document has ${problems.length} problem${problems.length > 1 ? 's' : ''}; nothing was changed.`,
    Object.fromEntries(problems.map((p) => [p.path, p.message])),
  );

async function present(imp: ProcessImport, transaction?: Transaction): Promise<ProcessImportJson> {
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
  return Promise.all(rows.map((r) => present(r)));
}

export async function importById(id: number) {
  const imp = await ProcessImport.findByPk(id);
  if (!imp) throw notFound('That import');
  return { ...(await present(imp)), document: imp.document };
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
    return present(imp, transaction);
  });
}

async function lockedDraft(id: number, transaction: Transaction) {
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
    return present(imp, transaction);
  });
}

/**
 * Adds what the document has and the plant lacks, in document order, and gives each changed route a
 * new version approved by `approverId`, in force from `effective` (the one before is superseded
 * then). Used by the approval of an import and by the demo seed, in the caller's transaction.
 */
export async function applyDocument(
  transaction: Transaction,
  doc: ProcessDocument,
  plan: ImportPlan,
  by: { authorId: number; approverId: number; reason: string; effective: Date; now: Date },
) {
  const want = <T>(list: string[]) => {
    const set = new Set(list);
    return (key: T & string) => set.has(key);
  };
  const kinds = want(plan.partKinds);
  for (const k of doc.partKinds) if (kinds(k.code)) await PartKindRow.create(k, { transaction });
  const families = want(plan.families);
  for (const f of doc.families) if (families(f.code)) await EngineFamily.create(f, { transaction });
  const stages = want(plan.stages);
  for (const s of doc.stages) {
    if (!stages(s.code)) continue;
    await Stage.create(
      {
        code: s.code,
        name: s.name,
        partKind: s.partKind as Stage['partKind'],
        hazard: s.caution,
        hazardous: s.hazardous,
        runTest: s.runTest,
        description: s.description,
      },
      { transaction },
    );
  }
  const stageRows = new Map((await Stage.findAll({ transaction })).map((s) => [s.code, s]));
  const chars = want(plan.characteristics);
  const order = new Map<number, number>();
  for (const c of doc.characteristics) {
    if (!chars(`${c.stage}/${c.code}`)) continue;
    const stage = stageRows.get(c.stage)!;
    if (!order.has(stage.id)) {
      order.set(
        stage.id,
        ((await Characteristic.max('sortOrder', { where: { stageId: stage.id }, transaction })) as number | null) ?? 0,
      );
    }
    order.set(stage.id, order.get(stage.id)! + 1);
    await Characteristic.create(
      {
        stageId: stage.id,
        code: c.code,
        name: c.name,
        kind: c.kind,
        unit: c.unit,
        resolution: c.resolution,
        positions: c.positions,
        derivation: null,
        critical: c.critical,
        optional: c.optional,
        sortOrder: order.get(stage.id)!,
        physicalMin: c.physicalMin,
        physicalMax: c.physicalMax,
        defectCode: c.defectCode,
        help: c.help,
        gaugeKinds: c.gaugeKinds,
        matesWith: c.matesWith,
      },
      { transaction },
    );
  }
  const familyRows = new Map((await EngineFamily.findAll({ transaction })).map((f) => [f.code, f]));
  const routes = want(plan.routes);
  const takesEffectNow = by.effective.getTime() <= by.now.getTime();
  const made: { id: number; family: string; partKind: string; version: number }[] = [];
  for (const r of doc.routes) {
    if (!routes(`${r.family} ${r.partKind}`)) continue;
    const family = familyRows.get(r.family)!;
    const where = { engineFamilyId: family.id, partKind: r.partKind };
    const others = await Route.findAll({
      where: { ...where, status: 'approved' },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    const pending = others.find((o) => o.effectiveFrom && o.effectiveFrom > by.now);
    if (pending) {
      throw conflict(
        `Version ${pending.version} of the ${r.family} ${r.partKind} route is already approved to take effect on ${pending.effectiveFrom!.toISOString()}. Only one version can wait to take effect.`,
      );
    }
    const draft = await Route.findOne({ where: { ...where, status: 'draft' }, transaction });
    if (draft) {
      throw conflict(
        `Version ${draft.version} of the ${r.family} ${r.partKind} route is a draft: approve or discard it before the import.`,
      );
    }
    for (const old of others) {
      await old.update(
        takesEffectNow
          ? { status: 'superseded', supersededAt: by.effective, active: false }
          : { supersededAt: by.effective },
        { transaction },
      );
    }
    const last = (await Route.max('version', { where, transaction })) as number | null;
    const route = await Route.create(
      {
        engineFamilyId: family.id,
        partKind: r.partKind as Route['partKind'],
        version: (last ?? 0) + 1,
        active: takesEffectNow,
        status: 'approved',
        note: r.note,
        createdById: by.authorId,
        approvedById: by.approverId,
        approvedAt: by.now,
        approvalReason: by.reason,
        effectiveFrom: by.effective,
      },
      { transaction },
    );
    await RouteStage.bulkCreate(
      r.steps.map((s, i) => ({
        routeId: route.id,
        stageId: stageRows.get(s.stage)!.id,
        position: i + 1,
        required: s.required,
        reworkToStageId: s.reworkTo ? stageRows.get(s.reworkTo)!.id : null,
      })),
      { transaction },
    );
    made.push({ id: route.id, family: r.family, partKind: r.partKind, version: route.version });
  }
  const castings = want(plan.castingNumbers);
  for (const c of doc.castingNumbers) {
    if (!castings(`${c.family} ${c.castingNumber}`)) continue;
    await FamilyCastingNumber.create(
      {
        engineFamilyId: familyRows.get(c.family)!.id,
        castingNumber: c.castingNumber,
        partKind: c.partKind,
        note: c.note,
      },
      { transaction },
    );
  }
  return { routes: made };
}

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
    return present(imp, transaction);
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
