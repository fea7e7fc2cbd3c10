import type { Sequelize } from 'sequelize';
import {
  capability,
  histogram,
  normalityCheck,
  RUN_RULE_TEXT,
  sampleSd,
  type BaselineRange,
  type ControlChart,
  type SpecLimits,
} from '../../../shared/domain/spc/index.js';
import {
  CHART_KIND_LABELS,
  periodBounds,
  type ChartLineJson,
  type SignalJson,
  type SpcChartJson,
  type SpcChartQuery,
  type SpecLimitsJson,
} from '../../../shared/schemas/spc.js';
import { invalid } from '../../errors.js';
import { limitsFor, limitsInForce, namesById, presentLimits } from './limits.js';
import { partReadings, type PartReadings } from './readings.js';
import { resolveScope } from './scope.js';
import { allValues, buildSeries, computeChart, limitsFit, type Series } from './series.js';

/**
 * A control chart of one family's characteristic over a period, with its capability, histogram
 * and normality check, all from one read of the stored readings. Frozen limits are used when they
 * fit the chart asked for; otherwise trial limits come from the baseline (the whole period when
 * none is chosen).
 */

/** The points whose time falls in the baseline, as an index range; null when it holds fewer than two. */
function baselineIndices(points: PartReadings[], from: Date, to: Date): BaselineRange | null {
  let first = -1;
  let last = -1;
  points.forEach((p, i) => {
    if (p.at >= from.getTime() && p.at < to.getTime()) {
      if (first < 0) first = i;
      last = i;
    }
  });
  return first >= 0 && last > first ? { from: first, to: last } : null;
}

function presentLine(c: ControlChart, count: number): ChartLineJson {
  const values: (number | null)[] = new Array<number | null>(count).fill(null);
  for (const p of c.points) values[p.index] = p.value;
  return {
    kind: c.kind,
    label: CHART_KIND_LABELS[c.kind],
    centre: c.centre,
    lower: c.lower,
    upper: c.upper,
    sigma: c.sigma,
    rules: c.rules,
    values,
  };
}

/**
 * Where the histogram's outer edges go. Readings are rounded to the resolution, so a rounded reading
 * conforms exactly when it lies within half a step of the limits: with the edges there, each bin is
 * centred on the values it holds (no bin left empty by the rounding, none straddling a limit).
 */
export function binEdges(spec: SpecLimitsJson | null, resolution: number | null): SpecLimits {
  if (!spec) return { lower: null, upper: null };
  const half = resolution ? resolution / 2 : 0;
  return {
    lower: spec.lower === null ? null : spec.lower - half,
    upper: spec.upper === null ? null : spec.upper + half,
  };
}

export function notesFor(series: Series): string[] {
  const notes: string[] = [];
  if (series.incomplete) {
    notes.push(
      `${series.incomplete} part${series.incomplete === 1 ? ' was' : 's were'} left out: fewer readings than the usual ${series.n} (a position not recorded, or read with another gauge).`,
    );
  }
  if (series.leftOver) {
    notes.push(`The last ${series.leftOver} part${series.leftOver === 1 ? '' : 's'} do not fill a subgroup yet.`);
  }
  return notes;
}

export async function spcChart(sequelize: Sequelize, q: SpcChartQuery): Promise<SpcChartJson> {
  const s = await resolveScope(sequelize, q);
  const period = periodBounds(q.from, q.to);
  const parts = await partReadings(sequelize, {
    familyId: s.family.id,
    characteristicId: s.characteristic.id,
    ...period,
    stationId: s.station?.id,
    gaugeId: s.gauge?.id,
  });
  const series = buildSeries(parts, q.chart, q.subgroup);
  const frozenRow = limitsFor(
    await limitsInForce(sequelize, s.ref),
    s.family.id,
    s.characteristic.id,
    s.station?.id ?? null,
  );
  const frozenBy = frozenRow ? ((await namesById([frozenRow.frozenById])).get(frozenRow.frozenById) ?? '') : '';
  const frozen = frozenRow ? presentLimits(frozenRow, s.ref, frozenBy) : null;
  const useFrozen = !!frozenRow && q.limits === 'frozen' && limitsFit(frozenRow.limits, series);

  let baseline: BaselineRange | null = null;
  if (!useFrozen && q.baselineFrom && q.baselineTo) {
    const b = periodBounds(q.baselineFrom, q.baselineTo);
    baseline = baselineIndices(series.points, b.from, b.to);
    if (!baseline) {
      throw invalid('The baseline holds fewer than two points of this chart.', {
        baselineTo: 'Choose a longer baseline.',
      });
    }
  }
  const notes = notesFor(series);
  const values = allValues(series.parts);
  const base = {
    family: { id: s.family.id, code: s.family.code, name: s.family.name },
    characteristic: {
      id: s.characteristic.id,
      code: s.characteristic.code,
      name: s.characteristic.name,
      unit: s.characteristic.unit,
      stage: s.stage.name,
    },
    period: { from: period.from.toISOString(), to: period.to.toISOString() },
    station: s.station?.code ?? null,
    gauge: s.gauge?.code ?? null,
    method: series.method,
    subgroupSize: series.n,
    points: series.points.map((p) => ({
      resultId: p.resultId,
      serial: p.serial,
      at: new Date(p.at).toISOString(),
      station: p.stationId ? (s.ref.stationById(p.stationId)?.code ?? null) : null,
    })),
    frozenElsewhere: frozen && !useFrozen ? frozen : null,
    spec: s.spec,
    readings: values.length,
  };
  if (!s.spec) notes.push(`No rule is in force for ${s.family.code}: capability needs the specification limits.`);

  if (series.subgroups.length < 2) {
    notes.push(
      `${series.subgroups.length === 0 ? 'No' : 'Only one'} complete point in this period: a chart needs at least two.`,
    );
    return {
      ...base,
      baseline: null,
      charts: [],
      signals: [],
      limits: null,
      capability: null,
      normality: values.length ? normalityCheck(values) : null,
      histogram: values.length
        ? histogram(values, s.spec ?? { lower: null, upper: null }, { resolution: s.resolution })
        : null,
      notes,
    };
  }

  const computed = computeChart(
    series,
    useFrozen ? { limits: frozenRow!.limits } : { baseline: baseline ?? undefined },
  );
  const signals: SignalJson[] = computed.charts.flatMap((c) =>
    c.signals.map((sig) => {
      const point = series.points[sig.index]!;
      return {
        index: sig.index,
        chart: c.kind,
        rule: sig.rule,
        text: RUN_RULE_TEXT[sig.rule],
        serial: point.serial,
        at: new Date(point.at).toISOString(),
        value: c.points.find((p) => p.index === sig.index)!.value,
      };
    }),
  );
  signals.sort((a, b) => a.index - b.index || a.rule - b.rule);
  const sd = sampleSd(values);
  if (s.resolution && sd > 0 && s.resolution > sd / 5) {
    const unit = s.characteristic.unit ? ` ${s.characteristic.unit}` : '';
    notes.push(
      `Readings are rounded to ${s.resolution}${unit}, more than a fifth of their spread (σ ${sd.toPrecision(2)}${unit}): the normality check sees the steps as much as the process, and fails on them when there are many readings.`,
    );
  }
  if (computed.sigmaWithin === 0)
    notes.push('The readings do not vary from part to part: the limits collapse onto the centre line.');
  const spec = s.spec && (s.spec.lower !== null || s.spec.upper !== null) ? s.spec : null;
  return {
    ...base,
    baseline: useFrozen ? null : (baseline ?? { from: 0, to: series.subgroups.length - 1 }),
    charts: computed.charts.map((c) => presentLine(c, series.points.length)),
    signals,
    limits: useFrozen
      ? { source: 'frozen', frozen: frozen! }
      : {
          source: 'trial',
          baselineFrom: baseline ? new Date(series.points[baseline.from]!.at).toISOString() : null,
          baselineTo: baseline ? new Date(series.points[baseline.to]!.at).toISOString() : null,
        },
    capability: spec ? capability(values, spec, { sigmaWithin: computed.sigmaWithin }) : null,
    normality: normalityCheck(values),
    histogram: histogram(values, binEdges(spec, s.resolution), { resolution: s.resolution }),
    notes,
  };
}
