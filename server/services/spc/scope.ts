import type { Sequelize, Transaction } from 'sequelize';
import { limitsOf } from '../../../shared/domain/tolerance.js';
import type { SpecLimitsJson } from '../../../shared/schemas/spc.js';
import { invalid, notFound } from '../../errors.js';
import type { Characteristic, EngineFamily, Gauge, Stage, Station } from '../../models/index.js';
import { referenceData, type Reference } from '../reference-cache.js';
import { inForceAt, toRuleInForce } from '../spec/rules.js';

/** What a chart, capability or rehearsal is about: one family's characteristic, perhaps one station or gauge. */
export type Scope = {
  ref: Reference;
  family: EngineFamily;
  characteristic: Characteristic;
  stage: Stage;
  station: Station | null;
  gauge: Gauge | null;
  /** The specification limits of the rule in force now; null when none is. */
  spec: SpecLimitsJson | null;
  /** The step readings are rounded to: the rule's, else the characteristic's. */
  resolution: number | null;
};

export type ScopeInput = { family: string; characteristicId: number; station?: string | null; gauge?: string | null };

/** Resolves codes through the reference data in memory; unknown codes are the caller's mistake (400/404). */
export async function resolveScope(sequelize: Sequelize, q: ScopeInput, transaction?: Transaction): Promise<Scope> {
  const ref = await referenceData(sequelize, transaction);
  const family = ref.families.find((f) => f.code === q.family.toUpperCase());
  if (!family) throw notFound(`Engine family ${q.family}`);
  const characteristic = ref.characteristic(q.characteristicId);
  if (!characteristic) throw notFound('That characteristic');
  // measured, or worked out from measured readings (out-of-round, taper): a pass/fail check has no values
  if (characteristic.kind === 'attribute') {
    throw invalid(`${characteristic.name} is a pass/fail check: control charts need measured readings.`, {
      characteristicId: 'Choose a measured characteristic.',
    });
  }
  const stage = ref.stage(characteristic.stageId)!;
  let station: Station | null = null;
  if (q.station) {
    station = ref.station(q.station.toUpperCase()) ?? null;
    if (!station) throw invalid(`There is no station ${q.station}.`, { station: `No station ${q.station}.` });
  }
  let gauge: Gauge | null = null;
  if (q.gauge) {
    gauge = ref.gauges.find((g) => g.code === q.gauge!.toUpperCase()) ?? null;
    if (!gauge) throw invalid(`There is no gauge ${q.gauge}.`, { gauge: `No gauge ${q.gauge}.` });
  }
  const rule = inForceAt(ref.rules(family.id, characteristic.id), new Date());
  const resolution = Number(rule?.resolution ?? characteristic.resolution ?? 0) || null;
  return {
    ref,
    family,
    characteristic,
    stage,
    station,
    gauge,
    spec: specNow(ref, family.id, characteristic.id),
    resolution,
  };
}

export function specNow(ref: Reference, familyId: number, characteristicId: number): SpecLimitsJson | null {
  const rule = inForceAt(ref.rules(familyId, characteristicId), new Date());
  if (!rule || rule.limitType === 'attribute') return null;
  const { lower, upper } = limitsOf(toRuleInForce(rule));
  return { lower, upper, ruleVersion: rule.version, unit: rule.unit };
}
