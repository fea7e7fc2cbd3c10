import { Op, QueryTypes, type Sequelize } from 'sequelize';
import { selectModels, type ReadSide } from '../read-side.js';
import type { AttachmentJson } from '../../shared/schemas/attachments.js';
import type { RecordedReading } from '../../shared/schemas/results.js';
import { describePosition, expandPositions } from '../../shared/domain/positions.js';
import type { RuleShape } from '../../shared/documents/format.js';
import { limitsOf } from '../../shared/domain/tolerance.js';
import { Attachment, Characteristic, Item, Reading, StageResult, ToleranceRule, User } from '../models/index.js';
import { presentAttachment } from './attachments.js';
import { groupBy } from './group-by.js';
import { referenceData, type Reference } from './reference-cache.js';
import { toRuleInForce } from './spec/rules.js';

const READING_COLUMNS = [
  'id',
  'stageResultId',
  'characteristicId',
  'position',
  'value',
  'passed',
  'unit',
  'enteredValue',
  'enteredUnit',
  'verdict',
  'toleranceRuleId',
  'ruleVersion',
  'locationNote',
  'gaugeId',
] as const;
type ReadingRow = Pick<Reading, (typeof READING_COLUMNS)[number]>;

/** One stored reading as the history screens show it (its shape is shared: shared/schemas/results.ts). */
export type { RecordedReading };

/**
 * Everything around a set of stage results, read once for all of them — readings, characteristics,
 * the rule versions used, stages, stations, gauges, operators, photos — in a fixed number of queries
 * however many results there are. An item's history and the trail both read through this.
 * Stages, stations, gauges, characteristics and rules come from the reference data in memory.
 * `ref`: the reference data, when the caller has it already.
 */
export async function loadResultRecords(
  results: StageResult[],
  items: Item[],
  { ref: known, read }: { ref?: Reference; read?: ReadSide } = {},
) {
  const ids = results.map((r) => r.id);
  const operatorIds = [...new Set(results.map((r) => r.operatorId))];
  const [readings, ref, photos, users] = await Promise.all([
    // plain rows, only the columns shown: a unit's trail has hundreds of readings
    ids.length && read
      ? read.db.query<ReadingRow>(
          `SELECT ${READING_COLUMNS.map((c) => `${Reading.getAttributes()[c].field} AS "${c}"`).join(', ')}
             FROM readings WHERE stage_result_id IN (:ids) ORDER BY id`,
          { type: QueryTypes.SELECT, replacements: { ids } },
        )
      : ids.length
        ? (Reading.findAll({
            where: { stageResultId: { [Op.in]: ids } },
            attributes: [...READING_COLUMNS],
            order: [['id', 'ASC']],
            raw: true,
          }) as unknown as Promise<ReadingRow[]>)
        : [],
    known ?? referenceData(Reading.sequelize as Sequelize),
    !ids.length
      ? []
      : read
        ? selectModels(read, Attachment, "entity = 'stage_result' AND entity_id IN (:ids)", { ids: ids.map(String) })
        : Attachment.findAll({ where: { entity: 'stage_result', entityId: { [Op.in]: ids.map(String) } } }),
    read
      ? read.db.query<{ id: number; name: string }>('SELECT id, name FROM users WHERE id IN (:operatorIds)', {
          type: QueryTypes.SELECT,
          replacements: { operatorIds: operatorIds.length ? operatorIds : [0] },
        })
      : User.findAll({ where: { id: { [Op.in]: operatorIds } }, attributes: ['id', 'name'] }),
  ]);
  const charIds = [...new Set(readings.map((r) => r.characteristicId))];
  const ruleIds = [...new Set(readings.map((r) => r.toleranceRuleId).filter((x): x is number => x !== null))];
  // a characteristic or rule the copy in memory lacks (withdrawn since, say) is read as it is stored
  const missingChars = charIds.filter((id) => !ref.characteristic(id));
  const missingRules = ruleIds.filter((id) => !ref.rule(id));
  const [moreChars, moreRules] = await Promise.all([
    missingChars.length ? Characteristic.findAll({ where: { id: { [Op.in]: missingChars } } }) : [],
    missingRules.length ? ToleranceRule.findAll({ where: { id: { [Op.in]: missingRules } } }) : [],
  ]);
  const chars = [...charIds.map((id) => ref.characteristic(id)).filter((c) => !!c), ...moreChars];
  const rules = [...ruleIds.map((id) => ref.rule(id)).filter((r) => !!r), ...moreRules];

  const itemById = new Map(items.map((i) => [i.id, i]));
  const charById = new Map(chars.map((c) => [c.id, c]));
  const limitsByRule = new Map(
    rules.map((r) => [r.id, r.limitType === 'attribute' ? { lower: null, upper: null } : limitsOf(toRuleInForce(r))]),
  );
  const shapeByRule = new Map<number, RuleShape>(
    rules.map((r) => {
      const f = toRuleInForce(r);
      return [
        r.id,
        {
          limitType: f.limitType,
          nominal: f.nominal ?? null,
          minusTol: f.minusTol ?? null,
          plusTol: f.plusTol ?? null,
          lowerLimit: f.lowerLimit ?? null,
          upperLimit: f.upperLimit ?? null,
          resolution: f.resolution ?? null,
        },
      ];
    }),
  );
  const nameById = new Map(users.map((u) => [u.id, u.name]));
  const readingsOf = groupBy(readings, (r) => r.stageResultId);
  const photosOf = groupBy(photos, (p) => p.entityId);
  const supersededBy = new Map(results.filter((r) => r.supersedesId).map((r) => [r.supersedesId!, r.id]));

  // position labels depend on the part (a V head covers its own bank): one expansion per item and characteristic
  const labelCache = new Map<string, Map<string, string>>();
  const labelOf = (itemId: number, c: Characteristic, pos: string) => {
    const key = `${itemId}:${c.id}`;
    let m = labelCache.get(key);
    if (!m) {
      const i = itemById.get(itemId)!;
      m = new Map(expandPositions(c.positions, ref.family(i.engineFamilyId)!, i).map((p) => [p.code, p.label]));
      labelCache.set(key, m);
    }
    return m.get(pos) ?? describePosition(pos);
  };

  return {
    stage: (r: StageResult) => ref.stage(r.stageId)!,
    station: (r: StageResult) => (r.stationId ? (ref.stationById(r.stationId) ?? null) : null),
    gauge: (r: StageResult) => (r.gaugeId ? (ref.gauge(r.gaugeId)?.code ?? null) : null),
    name: (userId: number) => nameById.get(userId) ?? '',
    photos: (r: StageResult): AttachmentJson[] => (photosOf.get(String(r.id)) ?? []).map(presentAttachment),
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
          entered:
            x.enteredValue === null || x.enteredUnit === null
              ? null
              : { value: Number(x.enteredValue), unit: x.enteredUnit },
          verdict: x.verdict,
          ruleId: x.toleranceRuleId,
          ruleVersion: x.ruleVersion,
          lower: limits.lower,
          upper: limits.upper,
          rule: (x.toleranceRuleId && shapeByRule.get(x.toleranceRuleId)) || null,
          location: x.locationNote,
          gauge: x.gaugeId ? (ref.gauge(x.gaugeId)?.code ?? null) : null,
        };
      }),
  };
}
