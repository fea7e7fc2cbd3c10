import type { Sequelize } from 'sequelize';
import type { LiftLockoutBody, Lockout, LockoutsJson } from '../../shared/schemas/auth.js';
import { recordAudit, type Ctx } from '../audit.js';
import { notFound } from '../errors.js';
import { accountKey, personKey, type Limits } from '../http/limits.js';
import { User } from '../models/index.js';

/** The lock-outs in force in this process: accounts and addresses at sign-in, people at a password re-entry. */
export async function listLockouts(limits: Limits): Promise<LockoutsJson> {
  const signIn = limits.signInAccount.locked();
  const password = limits.password.locked();
  const emails = signIn.map((l) => l.key);
  const ids = password.map((l) => Number(l.key.slice('user:'.length)));
  const people = await User.findAll({ where: { email: emails }, attributes: ['id', 'email', 'name'] });
  const byId = await User.findAll({ where: { id: ids }, attributes: ['id', 'email', 'name'] });
  const accounts: Lockout[] = [
    ...signIn.map((l) => {
      const u = people.find((p) => p.email === l.key);
      return {
        kind: 'sign-in' as const,
        email: l.key,
        userId: u?.id ?? null,
        name: u?.name ?? null,
        failures: l.failures,
        until: l.until.toISOString(),
      };
    }),
    ...password.map((l) => {
      const u = byId.find((p) => personKey(p.id) === l.key);
      return {
        kind: 'password' as const,
        email: u?.email ?? '',
        userId: u?.id ?? null,
        name: u?.name ?? null,
        failures: l.failures,
        until: l.until.toISOString(),
      };
    }),
  ];
  const addresses = limits.signInAddress
    .locked()
    .map((l) => ({ address: l.key, failures: l.failures, until: l.until.toISOString() }));
  return { accounts, addresses };
}

/** An admin lifts a lock-out: an account's (sign-in and password re-entry both) or an address's. */
export async function liftLockout(sequelize: Sequelize, ctx: Ctx, limits: Limits, body: LiftLockoutBody) {
  if ('address' in body) {
    if (!limits.signInAddress.clear(body.address)) throw notFound('A lock-out of that address');
    await sequelize.transaction((transaction) =>
      recordAudit(ctx, transaction, { action: 'address.lockout_lifted', entity: 'address', entityId: body.address }),
    );
    return;
  }
  const email = accountKey(body.email);
  const user = await User.findOne({ where: { email }, attributes: ['id'] });
  const liftedSignIn = limits.signInAccount.clear(email);
  const liftedPassword = user ? limits.password.clear(personKey(user.id)) : false;
  if (!liftedSignIn && !liftedPassword) throw notFound('A lock-out of that account');
  await sequelize.transaction((transaction) =>
    recordAudit(ctx, transaction, {
      action: 'user.lockout_lifted',
      entity: user ? 'user' : 'sign_in',
      entityId: user ? user.id : email,
      after: { email, signIn: liftedSignIn, password: liftedPassword },
    }),
  );
}
