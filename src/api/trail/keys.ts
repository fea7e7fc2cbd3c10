export const trailKeys = {
  all: ['trail'] as const,
  one: (serial: string) => ['trail', 'serial', serial] as const,
  lot: (lotCode: string) => ['trail', 'lot', lotCode] as const,
};
