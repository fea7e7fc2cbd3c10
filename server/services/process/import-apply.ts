import type { Transaction } from 'sequelize';
import type { ImportPlan, ProcessDocument } from '../../../shared/schemas/process-document.js';
import { conflict } from '../../errors.js';
import {
  Characteristic,
  EngineFamily,
  FamilyCastingNumber,
  PartKindRow,
  Route,
  RouteStage,
  Stage,
} from '../../models/index.js';

type Approval = { authorId: number; approverId: number; reason: string; effective: Date; now: Date };
type Made = { id: number; family: string; partKind: string; version: number };
type DocRoute = ProcessDocument['routes'][number];

/** Whether the plan adds the thing under `key`. */
const wanted = (list: string[]) => {
  const set = new Set(list);
  return (key: string) => set.has(key);
};

/**
 * Adds what the document has and the plant lacks, in document order, and gives each changed route a
 * new version approved by `approverId`, in force from `effective` (the one before is superseded
 * then). Used by the approval of an import and by the demo seed, in the caller's transaction.
 */
export async function applyDocument(transaction: Transaction, doc: ProcessDocument, plan: ImportPlan, by: Approval) {
  const kinds = wanted(plan.partKinds);
  for (const k of doc.partKinds) if (kinds(k.code)) await PartKindRow.create(k, { transaction });
  const families = wanted(plan.families);
  for (const f of doc.families) if (families(f.code)) await EngineFamily.create(f, { transaction });
  await addStages(transaction, doc, wanted(plan.stages));
  const stageRows = new Map((await Stage.findAll({ transaction })).map((s) => [s.code, s]));
  await addCharacteristics(transaction, doc, wanted(plan.characteristics), stageRows);
  const familyRows = new Map((await EngineFamily.findAll({ transaction })).map((f) => [f.code, f]));
  const routes = wanted(plan.routes);
  const made: Made[] = [];
  for (const r of doc.routes) {
    if (!routes(`${r.family} ${r.partKind}`)) continue;
    made.push(await addRouteVersion(transaction, r, familyRows.get(r.family)!, stageRows, by));
  }
  await addCastingNumbers(transaction, doc, wanted(plan.castingNumbers), familyRows);
  return { routes: made };
}

async function addStages(transaction: Transaction, doc: ProcessDocument, add: (code: string) => boolean) {
  for (const s of doc.stages) {
    if (!add(s.code)) continue;
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
}

/** Each new characteristic goes after the last of its stage. */
async function addCharacteristics(
  transaction: Transaction,
  doc: ProcessDocument,
  add: (key: string) => boolean,
  stageRows: Map<string, Stage>,
) {
  const order = new Map<number, number>();
  for (const c of doc.characteristics) {
    if (!add(`${c.stage}/${c.code}`)) continue;
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
}

/** A new approved version of one route; refused while another waits to take effect or is a draft. */
async function addRouteVersion(
  transaction: Transaction,
  r: DocRoute,
  family: EngineFamily,
  stageRows: Map<string, Stage>,
  by: Approval,
): Promise<Made> {
  const takesEffectNow = by.effective.getTime() <= by.now.getTime();
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
  return { id: route.id, family: r.family, partKind: r.partKind, version: route.version };
}

async function addCastingNumbers(
  transaction: Transaction,
  doc: ProcessDocument,
  add: (key: string) => boolean,
  familyRows: Map<string, EngineFamily>,
) {
  for (const c of doc.castingNumbers) {
    if (!add(`${c.family} ${c.castingNumber}`)) continue;
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
}
