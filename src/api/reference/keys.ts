export const referenceKeys = {
  stations: ['stations'] as const,
  stages: ['stages'] as const,
  families: ['engine-families'] as const,
  customers: ['customers'] as const,
  suppliers: ['suppliers'] as const,
};
