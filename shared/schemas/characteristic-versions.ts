import { z } from 'zod';
import { LOT_KINDS } from './build.js';
import { decimal, text } from './common.js';

/**
 * A change to a characteristic is a new version of its definition: what can change without
 * changing what its readings mean. Kind, unit, resolution and positions cannot: a characteristic
 * measured another way is a new characteristic, and the old one is retired.
 */
const physical = decimal(14, 6, 'Enter a number.').min(-1e6).max(1e6).nullable();

/** A draft names only what changes; the rest is carried over from the version in force. */
export const characteristicChangeBody = z
  .strictObject({
    name: text('Enter a name.').trim().min(2, 'Enter a name of at least 2 characters.').max(120),
    critical: z.boolean(),
    optional: z.boolean(),
    help: text().trim().max(300, 'At most 300 characters.'),
    gaugeKinds: z.array(text().trim().min(1).max(40)).max(10, 'At most 10 gauge kinds.'),
    defectCode: text().trim().toUpperCase().max(20).nullable(),
    physicalMin: physical,
    physicalMax: physical,
    matesWith: z.enum(LOT_KINDS, 'Choose a purchased part from the list.').nullable(),
  })
  .partial()
  .extend({
    note: text('Say what changes and why.')
      .trim()
      .min(5, 'Say what changes and why, in at least 5 characters.')
      .max(500, 'At most 500 characters.'),
  });
export type CharacteristicChangeBody = z.output<typeof characteristicChangeBody>;
export type CharacteristicDefinition = Required<Omit<CharacteristicChangeBody, 'note'>>;
export const DEFINITION_FIELDS = [
  'name',
  'critical',
  'optional',
  'help',
  'gaugeKinds',
  'defectCode',
  'physicalMin',
  'physicalMax',
  'matesWith',
] as const satisfies readonly (keyof CharacteristicDefinition)[];

export type CharacteristicVersionJson = {
  id: number;
  characteristicId: number;
  version: number;
  status: 'draft' | 'approved' | 'superseded' | 'discarded';
  inForce: boolean;
  definition: CharacteristicDefinition;
  note: string;
  /** The author (none for version 1, the definition as it stood before any change). */
  createdById: number | null;
  createdBy: string | null;
  approvedBy: string | null;
  approvedAt: string | null;
  approvalReason: string | null;
  effectiveFrom: string | null;
};

export type CharacteristicCompareJson = {
  left: CharacteristicVersionJson;
  right: CharacteristicVersionJson;
  rows: { field: string; left: unknown; right: unknown; changed: boolean }[];
};
