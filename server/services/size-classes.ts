import { Op, QueryTypes, type Transaction } from 'sequelize';
import { LOT_KIND_LABELS, type LotKind } from '../../shared/schemas/build.js';
import type { ChosenSizeClass } from '../../shared/schemas/results.js';
import { invalid } from '../errors.js';
import { Characteristic, Stage, StageResult, type Item } from '../models/index.js';
import type { Reference } from './reference-cache.js';
import { formCharacteristics, ruleForClass } from './spec/rules.js';
import { currentResultSql } from './results/current.js';

type FormChar = ReturnType<typeof formCharacteristics>[number];

const lower = (s: string) => s.charAt(0).toLowerCase() + s.slice(1);

/**
 * The size classes a station chose (the bore's oversize, the journal's undersize), checked against
 * the classes of each characteristic's rule version in force. Each chosen characteristic is then
 * judged to its class's limits (its form rule is replaced in place); every problem is listed at once.
 * A characteristic whose rule has classes must have one chosen when it is measured: the build matches
 * pistons and bearings to it, and the rule's own limits are only one of the classes.
 */
export function chooseSizeClasses(
  ref: Reference,
  chars: FormChar[],
  wanted: Record<string, string>,
  measured: ReadonlySet<string>,
): Record<string, ChosenSizeClass> {
  const problems: Record<string, string> = {};
  const chosen: Record<string, ChosenSizeClass> = {};
  for (const c of chars) {
    if (c.kind !== 'variable' || !measured.has(c.code) || c.code in wanted) continue;
    const classes = (c.rule ? ref.rule(c.rule.id)?.sizeClasses : undefined) ?? [];
    if (classes.length)
      problems[`sizeClasses.${c.code}`] =
        `${c.name}: choose the size class it was finished to (${classes.map((x) => x.code).join(', ')}).`;
  }
  for (const [code, classCode] of Object.entries(wanted)) {
    const field = `sizeClasses.${code}`;
    const c = chars.find((x) => x.code === code);
    if (!c || c.kind !== 'variable') {
      problems[field] = `${code} is not measured at this stage.`;
      continue;
    }
    const rule = c.rule ? ref.rule(c.rule.id) : undefined;
    const classes = rule?.sizeClasses ?? [];
    if (!rule || !classes.length) {
      problems[field] = `${c.name} has no size classes: leave it out.`;
      continue;
    }
    const k = classes.find((x) => x.code.toUpperCase() === classCode.toUpperCase());
    if (!k) {
      problems[field] =
        `${c.name} has no size class ${classCode}: choose one of ${classes.map((x) => x.code).join(', ')}.`;
      continue;
    }
    c.rule = ruleForClass(c.rule!, k);
    chosen[c.code] = { code: k.code, name: k.name, ruleId: rule.id };
  }
  const first = Object.values(problems)[0];
  if (first) throw invalid(`${first} Nothing was recorded.`, problems);
  return chosen;
}

/** The size classes recorded by a part's current result at a stage. */
async function classesAt(itemId: number, stageId: number, transaction: Transaction) {
  const [row] = await StageResult.sequelize!.query<{ size_classes: Record<string, ChosenSizeClass> }>(
    currentResultSql({ columns: 'r.size_classes', itemId: ':itemId', stageId: ':stageId' }),
    { type: QueryTypes.SELECT, replacements: { itemId, stageId }, transaction },
  );
  return row?.size_classes ?? {};
}

export type SizeMatch = { sizeClass: string; matchedTo: string };

/**
 * At build, each purchased part that mates with a sized characteristic (pistons with the bore,
 * main bearings with the main journals) must be of the class the part was finished to. Returns the
 * problems by field (`lots.N.sizeClass`), in plain words, and for each matched lot its class and
 * what it was matched to, for the build record.
 */
export async function matchSizeClasses(
  parts: { item: Item }[],
  lots: { kind: LotKind; sizeClass?: string | undefined }[],
  transaction: Transaction,
): Promise<{ problems: Record<string, string>; matched: Map<number, SizeMatch> }> {
  const problems: Record<string, string> = {};
  const matched = new Map<number, SizeMatch>();
  const mating = await Characteristic.findAll({
    where: { matesWith: { [Op.ne]: null }, retiredAt: null },
    order: [['id', 'ASC']],
    transaction,
  });
  for (const c of mating) {
    const i = lots.findIndex((l) => l.kind === c.matesWith);
    const stage = await Stage.findByPk(c.stageId, { transaction });
    const part = parts.find((p) => p.item.kind === stage?.partKind);
    if (i < 0 || !stage || !part) continue;
    const lot = lots[i]!;
    const recorded = (await classesAt(part.item.id, stage.id, transaction))[c.code];
    const label = LOT_KIND_LABELS[lot.kind].toLowerCase();
    const what = `${part.item.serial}'s ${lower(c.name)}`;
    const field = `lots.${i}.sizeClass`;
    if (recorded && !lot.sizeClass) {
      problems[field] =
        `${what} was finished to ${recorded.name} (${recorded.code}): say which size class the ${label} are.`;
    } else if (recorded && lot.sizeClass!.toUpperCase() !== recorded.code.toUpperCase()) {
      problems[field] =
        `The ${label} are size class ${lot.sizeClass}, but ${what} was finished to ${recorded.name} (${recorded.code}): use ${label} of class ${recorded.code}.`;
    } else if (!recorded && lot.sizeClass) {
      problems[field] =
        `${what} has no size class recorded at ${stage.name}, so ${label} of class ${lot.sizeClass} cannot be matched to it.`;
    } else if (recorded) {
      matched.set(i, { sizeClass: recorded.code, matchedTo: `${part.item.serial} ${lower(c.name)}: ${recorded.name}` });
    }
  }
  return { problems, matched };
}
