import type { ChartMethodChoice } from '../../../shared/schemas/spc';
import { CHART_METHODS } from '../../../shared/schemas/spc';
import type { SpecBookJson, SpecCharacteristicJson } from '../../../shared/schemas/spec';
import type { SpcChartQueryInput } from '../../api/spc/keys';

/** The chart the address asks for; what it leaves out takes the defaults the loader writes back. */
export type SpcFilter = SpcChartQueryInput;

const day = (d: Date) =>
  `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`;
const isDay = (v: string | null): v is string => !!v && /^\d{4}-\d{2}-\d{2}$/.test(v);

/** The last twelve months, today included. */
export function defaultPeriod(now = new Date()): { from: string; to: string } {
  const from = new Date(now);
  from.setFullYear(from.getFullYear() - 1);
  return { from: day(from), to: day(now) };
}

export function measured(book: SpecBookJson): (SpecCharacteristicJson & { stage: string })[] {
  return book.stages.flatMap((s) =>
    s.characteristics.filter((c) => c.kind === 'variable').map((c) => ({ ...c, stage: s.name })),
  );
}

/** The characteristic a first visit opens: the cylinder bore where there is one, else a critical one. */
export function defaultCharacteristic(book: SpecBookJson): number | null {
  const all = measured(book);
  return (all.find((c) => c.code === 'bore') ?? all.find((c) => c.critical) ?? all[0])?.id ?? null;
}

export function spcFilterFrom(params: URLSearchParams): SpcFilter | null {
  const family = params.get('family');
  const characteristicId = Number(params.get('characteristic'));
  const from = params.get('from');
  const to = params.get('to');
  if (!family || !Number.isInteger(characteristicId) || characteristicId <= 0 || !isDay(from) || !isDay(to)) {
    return null;
  }
  const chart = params.get('chart');
  const subgroup = Number(params.get('subgroup'));
  const baselineFrom = params.get('baselineFrom');
  const baselineTo = params.get('baselineTo');
  return {
    family: family.toUpperCase(),
    characteristicId,
    from,
    to,
    station: params.get('station') || undefined,
    gauge: params.get('gauge') || undefined,
    chart: CHART_METHODS.includes(chart as ChartMethodChoice) ? (chart as ChartMethodChoice) : undefined,
    subgroup: Number.isInteger(subgroup) && subgroup >= 2 ? subgroup : undefined,
    limits: params.get('limits') === 'trial' ? 'trial' : undefined,
    baselineFrom: isDay(baselineFrom) && isDay(baselineTo) ? baselineFrom : undefined,
    baselineTo: isDay(baselineFrom) && isDay(baselineTo) ? baselineTo : undefined,
  };
}
