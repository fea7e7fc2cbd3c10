import type { IntakeLogFilter } from './intake-log';

export const coreKeys = {
  all: ['cores'] as const,
  one: (serial: string) => ['cores', 'detail', serial] as const,
  log: (filter: IntakeLogFilter) => ['cores', 'log', filter] as const,
  duplicates: (numbers: { castingNumber: string; idNumber?: string }) => ['cores', 'duplicates', numbers] as const,
};
