import { z } from 'zod';
import { emailSchema, passwordSchema, roleSchema } from './auth.js';
import { paging, text } from './common.js';

export const personName = text().trim().min(2, 'Enter a name.').max(120);

export const createPersonBody = z.strictObject({
  email: emailSchema,
  name: personName,
  role: roleSchema,
  password: passwordSchema,
});
export type CreatePersonBody = z.infer<typeof createPersonBody>;

export const updatePersonBody = z
  .strictObject({
    name: personName.optional(),
    role: roleSchema.optional(),
    active: z.boolean().optional(),
  })
  .refine((b) => Object.keys(b).length > 0, 'Change at least one field.');
export type UpdatePersonBody = z.infer<typeof updatePersonBody>;

export const resetPasswordBody = z.strictObject({ password: passwordSchema });
export type ResetPasswordBody = z.infer<typeof resetPasswordBody>;

export const listPeopleQuery = z.strictObject({
  ...paging,
  q: text().trim().max(100).optional(),
  role: roleSchema.optional(),
  active: z.enum(['true', 'false']).optional(),
});

export type Person = {
  id: number;
  email: string;
  name: string;
  role: z.infer<typeof roleSchema>;
  active: boolean;
  /** Whether they sign in with an authenticator app as well. */
  secondFactor: boolean;
  lastSignInAt: string | null;
  createdAt: string;
};
