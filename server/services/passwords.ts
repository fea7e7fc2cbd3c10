import bcrypt from 'bcryptjs';

let cost = 12;

/** bcrypt cost: 12 in production; the test bootstrap may lower it for speed of fixtures only. */
export function setBcryptCost(c: number) {
  cost = c;
}

export const hashPassword = (plain: string) => bcrypt.hash(plain, cost);
export const checkPassword = (plain: string, hash: string) => bcrypt.compare(plain, hash);

// compared against when the account does not exist, so a wrong e-mail takes as long as a wrong
// password: made at the configured cost, since the time bcrypt takes depends on it
const dummyHashes = new Map<number, string>();
export function burnTime(plain: string) {
  let hash = dummyHashes.get(cost);
  if (!hash) dummyHashes.set(cost, (hash = bcrypt.hashSync('not-a-real-password-000', cost)));
  return bcrypt.compare(plain, hash);
}
