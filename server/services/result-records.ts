import { Op } from 'sequelize';
import type { AttachmentJson } from '../../shared/schemas/attachments.js';
import { describePosition, expandPositions } from '../../shared/domain/positions.js';
import { limitsOf } from '../../shared/domain/tolerance.js';
import {
  Attachment,
  Characteristic,
  EngineFamily,
  Gauge,
  Item,
  Reading,
  Stage,
  StageResult,
  Station,
  ToleranceRule,
  User,
} from '../models/index.js';
import { presentAttachment } from './attachments.js';
import { toRuleInForce } from './spec.js';

/** One stored reading as the history screens show it, with the limits of the rule version it was judged by. */
export type RecordedReading = {
  characteristic: string;
  name: string;
  kind: Characteristic['kind'];
  position: string;
  positionLabel: string;
  value: number | null;
  passed: boolean | null;
  unit: string | null;
  verdict: 'pass' | 'fail';
  ruleId: number | null;
  ruleVersion: number | null;
  lower: number | null;
  upper: number | null;
  location: string | null;
};

/**
 * Everything around a set of stage results, read once for all of them — readings, characteristics,
 * the rule versions used, stages, stations, gauges, operators, photos — in a fixed number of queries
 * however many results there are. An item's history and the trail both read through this.
 * `userIds`: more people whose names the caller needs (an NCR timeline's actors), read in the same query;
 * `families`: the engine families, when the caller has read them already.
 */
export async function loadResultRecords(
  results: StageResult[],
  items: Item[],
  { userIds = [], families: known }: { userIds?: number[]; families?: EngineFamily[] } = {},
) {
  const ids = results.map((r) => r.id);
  const [readings, stages, stations, gauges, families, photos, users] = await Promise.all([
    ids.length ? Reading.findAll({ where: { stageResultId: { [Op.in]: ids } }, order: [['id', 'ASC']] }) : [],
    Stage.findAll(),
    Station.findAll(),
    Gauge.findAll(),
    known ?? EngineFamily.findAll(),
    ids.length ? Attachment.findAll({ where: { entity: 'stage_result', entityId: { [Op.in]: ids.map(String) } } }) : [],
    User.findAll({
      where: { id: { [Op.in]: [...new Set([...results.map((r) => r.operatorId), ...userIds])] } },
      attributes: ['id', 'name'],
    }),
  ]);
  const charIds = [...new Set(readings.map((r) => r.characteristicId))];
  const ruleIds = [...new Set(readings.map((r) => r.toleranceRuleId).filter((x): x is number => x !== null))];
  const [chars, rules] = await Promise.all([
    charIds.length ? Characteristic.findAll({ where: { id: { [Op.in]: charIds } } }) : [],
    ruleIds.length ? ToleranceRule.findAll({ where: { id: { [Op.in]: ruleIds } } }) : [],
  ]);

  const itemById = new Map(items.map((i) => [i.id, i]));
  const familyById = new Map(families.map((f) => [f.id, f]));
  const charById = new Map(chars.map((c) => [c.id, c]));
  const limitsByRule = new Map(
    rules.map((r) => [r.id, r.limitType === 'attribute' ? { lower: null, upper: null } : limitsOf(toRuleInForce(r))]),
  );
  const stageById = new Map(stages.map((s) => [s.id, s]));
  const stationById = new Map(stations.map((s) => [s.id, s]));
  const gaugeById = new Map(gauges.map((g) => [g.id, g.code]));
  const nameById = new Map(users.map((u) => [u.id, u.name]));
  const readingsOf = new Map<number, Reading[]>();
  for (const r of readings) readingsOf.set(r.stageResultId, [...(readingsOf.get(r.stageResultId) ?? []), r]);
  const photosOf = new Map<string, AttachmentJson[]>();
  for (const p of photos) photosOf.set(p.entityId, [...(photosOf.get(p.entityId) ?? []), presentAttachment(p)]);
  const supersededBy = new Map(results.filter((r) => r.supersedesId).map((r) => [r.supersedesId!, r.id]));

  // position labels depend on the part (a V head covers its own bank): one expansion per item and characteristic
  const labelCache = new Map<string, Map<string, string>>();
  const labelOf = (itemId: number, c: Characteristic, pos: string) => {
    const key = `${itemId}:${c.id}`;
    let m = labelCache.get(key);
    if (!m) {
      const i = itemById.get(itemId)!;
      m = new Map(expandPositions(c.positions, familyById.get(i.engineFamilyId)!, i).map((p) => [p.code, p.label]));
      labelCache.set(key, m);
    }
    return m.get(pos) ?? describePosition(pos);
  };

  return {
    stage: (r: StageResult) => stageById.get(r.stageId)!,
    station: (r: StageResult) => (r.stationId ? (stationById.get(r.stationId) ?? null) : null),
    gauge: (r: StageResult) => (r.gaugeId ? (gaugeById.get(r.gaugeId) ?? null) : null),
    name: (userId: number) => nameById.get(userId) ?? '',
    photos: (r: StageResult) => photosOf.get(String(r.id)) ?? [],
    supersededBy: (r: StageResult) => supersededBy.get(r.id) ?? null,
    readings: (r: StageResult): RecordedReading[] =>
      (readingsOf.get(r.id) ?? []).map((x) => {
        const c = charById.get(x.characteristicId)!;
        const limits = (x.toleranceRuleId && limitsByRule.get(x.toleranceRuleId)) || { lower: null, upper: null };
        return {
          characteristic: c.code,
          name: c.name,
          kind: c.kind,
          position: x.position,
          positionLabel: labelOf(r.itemId, c, x.position),
          value: x.value === null ? null : Number(x.value),
          passed: x.passed,
          unit: x.unit,
          verdict: x.verdict,
          ruleId: x.toleranceRuleId,
          ruleVersion: x.ruleVersion,
          lower: limits.lower,
          upper: limits.upper,
          location: x.locationNote,
        };
      }),
  };
}
