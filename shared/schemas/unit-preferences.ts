import { z } from 'zod';
import { sameQuantity, unitOf } from '../domain/units.js';
import { text } from './common.js';

/** A unit Coretrail knows (shared/domain/units), by its symbol or a common spelling of it; parsed to the symbol. */
export const unitSymbol = (what = 'unit') =>
  text(`Choose the ${what}.`)
    .trim()
    .max(20, 'At most 20 characters.')
    .refine((u) => unitOf(u) !== null, `Choose a ${what} from the list (mm, in, kPa, psi, N·m, lbf·ft …).`)
    .transform((u) => unitOf(u)!.symbol);

/** The unit a person types readings in where a characteristic is kept in `unit`; null forgets it. */
export const unitPreferenceBody = z
  .strictObject({
    unit: unitSymbol('characteristic’s unit'),
    enteredUnit: unitSymbol('unit to type in').nullable(),
  })
  .refine((b) => b.enteredUnit === null || b.enteredUnit !== b.unit, {
    path: ['enteredUnit'],
    message: 'That is the characteristic’s own unit: choose another, or none to forget the preference.',
  })
  .refine((b) => b.enteredUnit === null || sameQuantity(b.unit, b.enteredUnit), {
    path: ['enteredUnit'],
    message:
      'A reading can only be typed in a unit of the same quantity (a length in mm or in, a pressure in kPa or psi).',
  });
export type UnitPreferenceBody = z.output<typeof unitPreferenceBody>;

/** Characteristic unit → the unit this person types it in. */
export type UnitPreferencesJson = { preferences: Record<string, string> };
