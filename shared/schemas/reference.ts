import { z } from 'zod';
import { text } from './common.js';

export const PART_KINDS = [
  'core',
  'block',
  'crankshaft',
  'cylinder_head',
  'camshaft',
  'rod_set',
  'long_block',
] as const;
export const partKindSchema = z.enum(PART_KINDS);
export type PartKind = z.infer<typeof partKindSchema>;

export const PART_KIND_LABELS: Record<PartKind, string> = {
  core: 'Core',
  block: 'Block',
  crankshaft: 'Crankshaft',
  cylinder_head: 'Cylinder head',
  camshaft: 'Camshaft',
  rod_set: 'Connecting-rod set',
  long_block: 'Long block',
};

export const LAYOUTS = ['inline', 'v'] as const;

const code = text()
  .trim()
  .toUpperCase()
  .regex(/^[A-Z0-9][A-Z0-9-]{1,19}$/, 'Use 2–20 letters, digits or dashes.');

export const createStationBody = z.strictObject({
  code,
  name: text().trim().min(2, 'Enter a name of at least 2 characters.').max(80, 'At most 80 characters.'),
  stageCode: text().trim().min(1).max(40).nullable(),
  location: text().trim().max(80).optional(),
});
export type CreateStationBody = z.infer<typeof createStationBody>;

export const updateStationBody = z
  .strictObject({
    name: text().trim().min(2).max(80).optional(),
    stageCode: text().trim().min(1).max(40).nullable().optional(),
    location: text().trim().max(80).optional(),
    active: z.boolean().optional(),
  })
  .refine((b) => Object.keys(b).length > 0, 'Change at least one field.');
export type UpdateStationBody = z.infer<typeof updateStationBody>;

export const familyBody = z
  .strictObject({
    code,
    name: text().trim().min(2).max(80),
    description: text().trim().max(500).default(''),
    layout: z.enum(LAYOUTS),
    cylinders: z
      .number('Enter the number of cylinders.')
      .int('Use a whole number.')
      .min(1, 'At least 1.')
      .max(16, 'At most 16.'),
    boreMm: z.number('Enter the bore in mm.').positive('The bore must be more than 0 mm.').max(300, 'At most 300 mm.'),
    // numeric(7, 3): a bore or stroke converted from inches keeps 0.001 mm, which is all a family's description needs
    strokeMm: z
      .number('Enter the stroke in mm.')
      .positive('The stroke must be more than 0 mm.')
      .max(300, 'At most 300 mm.'),
    headsPerEngine: z
      .number('Enter the number of heads.')
      .int('Use a whole number.')
      .min(1, 'At least 1.')
      .max(2, 'At most 2.'),
    warrantyMonths: z
      .number('Enter the warranty in months.')
      .int('Use whole months.')
      .min(0, 'Not negative.')
      .max(120, 'At most 120 months.'),
    warrantyKm: z
      .number('Enter a distance or leave it empty.')
      .int('Use whole kilometres.')
      .min(0, 'Not negative.')
      .max(2_000_000, 'At most 2 000 000 km.')
      .nullable(),
    active: z.boolean().default(true),
  })
  .refine((f) => (f.layout === 'inline' ? f.headsPerEngine === 1 : f.headsPerEngine === 2), {
    message: 'An inline engine has one head; a V engine has two.',
    path: ['headsPerEngine'],
  })
  .refine((f) => f.layout === 'inline' || f.cylinders % 2 === 0, {
    message: 'A V engine has an even number of cylinders.',
    path: ['cylinders'],
  });
export type FamilyBody = z.infer<typeof familyBody>;

export type Station = {
  id: number;
  code: string;
  name: string;
  stageCode: string | null;
  stageName: string | null;
  location: string;
  active: boolean;
};

export type EngineFamily = FamilyBody & { id: number; displacementL: number };

export type Stage = {
  id: number;
  code: string;
  name: string;
  partKind: PartKind;
  hazard: string | null;
};

/** A customer or supplier the plant adds: its own short code, a name and where to write to. */
export const createPartyBody = z.strictObject({
  code,
  name: text().trim().min(2, 'Enter a name of at least 2 characters.').max(120, 'At most 120 characters.'),
  email: text()
    .trim()
    .toLowerCase()
    .max(254, 'At most 254 characters.')
    .pipe(z.union([z.literal(''), z.email('Enter an e-mail address.')]))
    .optional(),
});
export type CreatePartyBody = z.infer<typeof createPartyBody>;
