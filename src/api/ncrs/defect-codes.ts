/**
 * The plant's defect codes. There is no endpoint listing them yet, so this mirrors the list
 * db/seeders/plant.ts loads; the server still checks every code it is sent against its own table.
 */
export const DEFECT_CODES = [
  { code: 'CRK', description: 'Crack found' },
  { code: 'LEAK', description: 'Leak under pressure or vacuum' },
  { code: 'OOT', description: 'Dimension out of tolerance' },
  { code: 'FIN', description: 'Surface finish out of range' },
  { code: 'DMG', description: 'Handling or visible damage' },
  { code: 'WRONG', description: 'Wrong part or wrong family' },
  { code: 'LOT', description: 'Purchased lot suspect' },
  { code: 'RUN', description: 'Run test out of limits' },
  { code: 'OTHER', description: 'Other (describe)' },
] as const;

export const defectDescription = (code: string | null | undefined): string | undefined =>
  DEFECT_CODES.find((d) => d.code === code)?.description;
