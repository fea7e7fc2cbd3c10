import type { Transaction } from 'sequelize';
import {
  crossCheck,
  type DocumentProblem,
  type ImportPlan,
  type ProcessDocument,
} from '../../../shared/schemas/process-document.js';
import { AppError } from '../../errors.js';
import {
  Characteristic,
  DefectCode,
  EngineFamily,
  FamilyCastingNumber,
  PartKindRow,
  Route,
  RouteStage,
  Stage,
} from '../../models/index.js';

/** A process document checked against the plant as it is: its problems by path, or what it would add. */

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
export async function planFor(
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

export const refuse = (problems: DocumentProblem[], code: 'invalid' | 'conflict' = 'invalid') =>
  new AppError(
    code,
    `The document has ${problems.length} problem${problems.length > 1 ? 's' : ''}; nothing was changed.`,
    Object.fromEntries(problems.map((p) => [p.path, p.message])),
  );
