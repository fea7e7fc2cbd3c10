import type { Transaction } from 'sequelize';
import type { Ctx } from '../audit.js';
import { AppError } from '../errors.js';
import { Signature, User } from '../models/index.js';
import { checkPassword } from './passwords.js';

/**
 * An electronic signature: the signer's password checked again at the moment of signing, then a
 * record of who signed (printed name), what the signature means, why, and when. A wrong password
 * signs nothing, and the caller's transaction rolls back with it.
 */
export async function signWithPassword(
  ctx: Ctx,
  transaction: Transaction,
  input: { entity: string; entityId: string; meaning: string; reason: string; password: string; refused: string },
) {
  const user = (await User.findByPk(ctx.actor!.id, { transaction }))!;
  if (!(await checkPassword(input.password, user.passwordHash))) {
    throw new AppError('signature_refused', `The password does not match: ${input.refused}`, {
      password: 'That is not your password.',
    });
  }
  const signature = await Signature.create(
    {
      userId: user.id,
      printedName: user.name,
      meaning: input.meaning,
      reason: input.reason,
      entity: input.entity,
      entityId: input.entityId,
      signedAt: new Date(),
    },
    { transaction },
  );
  return { user, signature };
}

export type SignatureJson = { printedName: string; meaning: string; reason: string; signedAt: string };

export const presentSignature = (s: Signature): SignatureJson => ({
  printedName: s.printedName,
  meaning: s.meaning,
  reason: s.reason,
  signedAt: s.signedAt.toISOString(),
});
