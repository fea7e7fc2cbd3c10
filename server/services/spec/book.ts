import type { RuleHistoryJson, SpecBookJson } from '../../../shared/schemas/spec.js';
import { notFound } from '../../errors.js';
import { Characteristic, Stage, ToleranceRule } from '../../models/index.js';
import { namesOf, presentCharacteristic, presentRule, signaturesOf } from './present.js';
import { familyByCode } from './rules.js';

/** Reading the spec book: a family's whole book, and one rule's history. */

/** One family's whole spec book, stage by stage, in four queries whatever its size. */
export async function specBook(familyCode: string): Promise<SpecBookJson> {
  const family = await familyByCode(familyCode);
  const [stages, characteristics, rules] = await Promise.all([
    Stage.findAll({ order: [['id', 'ASC']] }),
    Characteristic.findAll({
      order: [
        ['sortOrder', 'ASC'],
        ['id', 'ASC'],
      ],
    }),
    ToleranceRule.findAll({ where: { engineFamilyId: family.id }, order: [['version', 'ASC']] }),
  ]);
  const [names, sigs] = await Promise.all([
    namesOf(rules.flatMap((r) => [r.createdById, r.approvedById])),
    signaturesOf(rules.map((r) => r.id)),
  ]);
  const now = new Date();
  const rulesOf = new Map<number, ToleranceRule[]>();
  for (const r of rules) rulesOf.set(r.characteristicId, [...(rulesOf.get(r.characteristicId) ?? []), r]);
  return {
    family: { id: family.id, code: family.code, name: family.name },
    stages: stages
      .map((s) => ({
        code: s.code,
        name: s.name,
        partKind: s.partKind,
        characteristics: characteristics
          .filter((c) => c.stageId === s.id)
          .map((c) => presentCharacteristic(c, rulesOf.get(c.id) ?? [], names, sigs, now)),
      }))
      .filter((s) => s.characteristics.length > 0),
  };
}

export async function ruleHistory(familyCode: string, characteristicId: number): Promise<RuleHistoryJson> {
  const family = await familyByCode(familyCode);
  const c = await Characteristic.findByPk(characteristicId, { include: [{ model: Stage, as: 'stage' }] });
  if (!c) throw notFound('That characteristic');
  const rules = await ToleranceRule.findAll({
    where: { engineFamilyId: family.id, characteristicId },
    order: [['version', 'DESC']],
  });
  const [names, sigs] = await Promise.all([
    namesOf(rules.flatMap((r) => [r.createdById, r.approvedById])),
    signaturesOf(rules.map((r) => r.id)),
  ]);
  const stage = (c as Characteristic & { stage: Stage }).stage;
  return {
    family: { id: family.id, code: family.code, name: family.name },
    characteristic: presentCharacteristic(c, [...rules].reverse(), names, sigs, new Date()),
    stage: { code: stage.code, name: stage.name },
    versions: rules.map((r) => presentRule(r, names, sigs)),
  };
}
