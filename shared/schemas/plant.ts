import { z } from 'zod';
import { isTimeZone } from '../domain/warranty.js';
import { text } from './common.js';

/** The plant's identity and calendar. */
export const plantBody = z
  .strictObject({
    name: text('Enter the plant’s name.').trim().min(2, 'Enter the plant’s name.').max(120),
    address: text().trim().max(300, 'At most 300 characters.'),
    timeZone: text('Choose the plant’s time zone.')
      .trim()
      .min(1, 'Choose the plant’s time zone.')
      .max(60)
      .refine(isTimeZone, 'Not a time zone this server knows; use a name like America/Chicago.'),
    ncrOverdueDays: z.number().int('Use a whole number of days.').min(1).max(365, 'At most 365 days.'),
    holdAlertHours: z.number().int('Use a whole number of hours.').min(1).max(8760, 'At most 8760 hours (a year).'),
  })
  .partial()
  .refine((b) => Object.keys(b).length > 0, 'Change at least one field.');
export type PlantBody = z.output<typeof plantBody>;

export type PlantJson = {
  name: string;
  address: string;
  timeZone: string;
  today: string;
  /** Alerts on the homes: an open NCR older than this is overdue; a hold older than this is shown. */
  ncrOverdueDays: number;
  holdAlertHours: number;
};
