import type { Sequelize } from 'sequelize';
import { capability, normalityCheck } from '../../../shared/domain/spc/index.js';
import {
  periodBounds,
  type CapabilityRowJson,
  type SpcCapabilityJson,
  type SpcCapabilityQuery,
} from '../../../shared/schemas/spc.js';
import { partReadings, type PartReadings } from './readings.js';
import { resolveScope, type Scope } from './scope.js';
import { allValues, buildSeries, computeChart } from './series.js';

/**
 * Capability of a characteristic over a period: all stations and gauges together, then each
 * station × gauge on its own, so a gauge or a machine that reads differently shows. σ within comes
 * from each group's own chart (part means or individuals, in time order); Pp and Ppk from every reading.
 */

function row(s: Scope, station: string | null, gauge: string | null, parts: PartReadings[]): CapabilityRowJson {
  const series = buildSeries(parts, 'auto');
  const values = allValues(series.parts);
  const empty: CapabilityRowJson = {
    station,
    gauge,
    parts: series.parts.length,
    readings: values.length,
    mean: values.length ? values.reduce((a, b) => a + b, 0) / values.length : null,
    sigmaWithin: null,
    cp: null,
    cpk: null,
    cpkLower: null,
    cpkUpper: null,
    pp: null,
    ppk: null,
    normal: null,
    pValue: null,
    note: null,
  };
  const spec = s.spec && (s.spec.lower !== null || s.spec.upper !== null) ? s.spec : null;
  if (!spec) return { ...empty, note: 'No rule in force.' };
  if (series.subgroups.length < 2) return { ...empty, note: 'Fewer than two complete parts.' };
  const sigma = computeChart(series).sigmaWithin;
  const c = capability(values, spec, { sigmaWithin: sigma });
  const normality = normalityCheck(values);
  return {
    ...empty,
    mean: c.mean,
    sigmaWithin: sigma,
    cp: c.within?.potential ?? null,
    cpk: c.within?.index ?? null,
    cpkLower: c.within?.interval.lower ?? null,
    cpkUpper: c.within?.interval.upper ?? null,
    pp: c.overall?.potential ?? null,
    ppk: c.overall?.index ?? null,
    normal: normality.checked ? normality.normal : null,
    pValue: normality.checked ? normality.pValue : null,
    note: normality.checked ? null : `Normality not checked: ${normality.reason}.`,
  };
}

export async function spcCapability(sequelize: Sequelize, q: SpcCapabilityQuery): Promise<SpcCapabilityJson> {
  const s = await resolveScope(sequelize, q);
  const period = periodBounds(q.from, q.to);
  const parts = await partReadings(sequelize, {
    familyId: s.family.id,
    characteristicId: s.characteristic.id,
    ...period,
    stationId: s.station?.id,
    gaugeId: s.gauge?.id,
  });
  const groups = new Map<string, PartReadings[]>();
  for (const p of parts) {
    const key = `${p.stationId ?? 0}:${p.gaugeId ?? 0}`;
    const g = groups.get(key);
    if (g) g.push(p);
    else groups.set(key, [p]);
  }
  const stationCode = (id: number | null) => (id ? (s.ref.stationById(id)?.code ?? null) : null);
  const gaugeCode = (id: number | null) => (id ? (s.ref.gauge(id)?.code ?? null) : null);
  const rows = [...groups.values()]
    .map((g) => row(s, stationCode(g[0]!.stationId), gaugeCode(g[0]!.gaugeId), g))
    .sort((a, b) => `${a.station}${a.gauge}`.localeCompare(`${b.station}${b.gauge}`));
  return {
    family: { id: s.family.id, code: s.family.code, name: s.family.name },
    characteristic: {
      id: s.characteristic.id,
      code: s.characteristic.code,
      name: s.characteristic.name,
      unit: s.characteristic.unit,
    },
    period: { from: period.from.toISOString(), to: period.to.toISOString() },
    spec: s.spec,
    rows: [row(s, s.station?.code ?? null, s.gauge?.code ?? null, parts), ...(groups.size > 1 ? rows : [])],
  };
}
