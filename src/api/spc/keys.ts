import type { SpcCapabilityQuery, SpcChartQuery } from '../../../shared/schemas/spc';

/** Family codes are upper case on the server; keys use that form so one chart has one cache entry. */
export const spcKeys = {
  all: ['spc'] as const,
  chart: (q: SpcChartQueryInput) => ['spc', 'chart', { ...q, family: q.family.toUpperCase() }] as const,
  capability: (q: SpcCapabilityQueryInput) => ['spc', 'capability', { ...q, family: q.family.toUpperCase() }] as const,
  limits: (family: string, characteristicId: number) =>
    ['spc', 'limits', family.toUpperCase(), characteristicId] as const,
  signals: (family: string, characteristicId: number) =>
    ['spc', 'signals', family.toUpperCase(), characteristicId] as const,
  rehearsals: (ruleId: number) => ['spc', 'rehearsals', ruleId] as const,
};

/** What the chart endpoint takes, as the page sends it (defaults left to the server). */
export type SpcChartQueryInput = Partial<Omit<SpcChartQuery, 'family' | 'characteristicId' | 'from' | 'to'>> &
  Pick<SpcChartQuery, 'family' | 'characteristicId' | 'from' | 'to'>;
export type SpcCapabilityQueryInput = SpcCapabilityQuery;
