import type { AnalysisQuery, ClaimListQuery } from '../../../shared/schemas/warranty';

export const warrantyKeys = {
  all: ['warranty'] as const,
  claims: (q: Partial<ClaimListQuery>) => ['warranty', 'claims', q] as const,
  claim: (number: string) => ['warranty', 'claim', number] as const,
  coverage: (serial: string, failedOn: string, km: number | null) =>
    ['warranty', 'coverage', serial, failedOn, km] as const,
  causeCodes: ['warranty', 'cause-codes'] as const,
  analysis: (q: Partial<AnalysisQuery>) => ['warranty', 'analysis', q] as const,
  weibull: (q: Partial<AnalysisQuery>) => ['warranty', 'weibull', q] as const,
  credit: (serial: string) => ['warranty', 'credit', serial] as const,
};
