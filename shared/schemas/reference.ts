import { z } from 'zod';

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

const code = z
  .string()
  .trim()
  .toUpperCase()
  .regex(/^[A-Z0-9][A-Z0-9-]{1,19}$/, 'Use 2–20 letters, digits or dashes.');

export const createStationBody = z.strictObject({
  code,
  name: z.string().trim().min(2).max(80),
  stageCode: z.string().trim().min(1).max(40).nullable(),
  location: z.string().trim().max(80).optional(),
});
export type CreateStationBody = z.infer<typeof createStationBody>;

export const updateStationBody = z
  .strictObject({
    name: z.string().trim().min(2).max(80).optional(),
    stageCode: z.string().trim().min(1).max(40).nullable().optional(),
    location: z.string().trim().max(80).optional(),
    active: z.boolean().optional(),
  })
  .refine((b) => Object.keys(b).length > 0, 'Change at least one field.');
export type UpdateStationBody = z.infer<typeof updateStationBody>;

export const familyBody = z
  .strictObject({
    code,
    name: z.string().trim().min(2).max(80),
    description: z.string().trim().max(500).default(''),
    layout: z.enum(LAYOUTS),
    cylinders: z.number().int().min(1).max(16),
    boreMm: z.number().positive().max(300),
    strokeMm: z.number().positive().max(300),
    headsPerEngine: z.number().int().min(1).max(2),
    warrantyMonths: z.number().int().min(0).max(120),
    warrantyKm: z.number().int().min(0).max(2_000_000).nullable(),
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
