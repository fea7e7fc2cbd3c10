export const defectCodeKeys = {
  all: ['defect-codes'] as const,
};
