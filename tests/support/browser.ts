import type { Server } from 'node:http';
import path from 'node:path';
import { QueryTypes, type Sequelize } from 'sequelize';
import { chromium, type Browser, type Page } from 'playwright-core';
import { sealSecret, totpCode } from '../../server/auth/totp.js';
import type { Config } from '../../server/config.js';
import { MailWorker } from '../../server/mail/worker.js';
import { User } from '../../server/models/index.js';
import { makeTestApp, type TestApp } from './app.js';

export const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
];

export type Served = { t: TestApp; server: Server; base: string; close: () => Promise<void> };

/** The real app, client included, on a free loopback port (`overrides`: e.g. a database of the file's own). */
export async function serveApp(overrides: Partial<Config> = {}): Promise<Served> {
  const t = makeTestApp({ CLIENT_DIR: process.env.CLIENT_DIR ?? path.resolve('dist'), ...overrides });
  const server = await new Promise<Server>((resolve) => {
    const s = t.app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const addr = server.address();
  const base = `http://127.0.0.1:${typeof addr === 'object' && addr ? addr.port : 0}`;
  return {
    t,
    server,
    base,
    close: async () => {
      await new Promise((r) => server.close(r));
      await t.close();
    },
  };
}

export function launch(extraArgs: string[] = []): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: [...CHROMIUM_ARGS, ...extraArgs],
  });
}

/** The authenticator secret the browser tests give an administrator (base32 of 20 bytes). */
export const TEST_TOTP_SECRET = 'GEZDGNBVGY3TQOJQGEZDGNBVGY3TQOJQ';

/** Gives an account the test secret, as if it had enrolled (administrators must have one). */
export async function givenSecondFactor(email: string, config: Config) {
  const user = (await User.findOne({ where: { email } }))!;
  if (user.totpSecret) return;
  await user.update({ totpSecret: sealSecret(TEST_TOTP_SECRET, config.JWT_SECRET), totpEnrolledAt: new Date() });
}

/**
 * What the phone would show next: a code for a time step newer than the last one the account used
 * (each code signs in once), waiting for the clock when the step after this one is taken too.
 */
export async function nextCode(email: string, secret = TEST_TOTP_SECRET): Promise<string> {
  const user = (await User.findOne({ where: { email } }))!;
  const step = Math.floor(Date.now() / 30_000);
  const target = Math.max(step, (user.totpLastStep ?? -1) + 1);
  // the server accepts one step ahead of its clock; past that, wait until the clock catches up
  if (target > step + 1) await new Promise((r) => setTimeout(r, (target - 1) * 30_000 - Date.now() + 200));
  return totpCode(secret, target * 30_000);
}

export async function signIn(page: Page, base: string, email: string, password: string) {
  await page.goto(`${base}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  // the home's heading in English ("Station operator home") or in Spanish ("Inicio: Operador de estación")
  const home = page.getByRole('heading', { level: 1, name: / home$|^Inicio: / });
  const code = page.getByLabel('Code from your authenticator app');
  // whichever comes: the home page, or the question for a second-factor code
  await home.or(code).first().waitFor();
  if (await code.isVisible()) {
    await code.fill(await nextCode(email));
    await page.getByRole('button', { name: 'Sign in' }).click();
  }
  await home.waitFor();
}

/** The outbox's newest id now: a browser walk later delivers only what was queued after it. */
export async function newestMailId(sequelize: Sequelize): Promise<string> {
  const [row] = await sequelize.query<{ id: string }>('SELECT coalesce(max(id), 0)::text AS id FROM mail_outbox', {
    type: QueryTypes.SELECT,
  });
  return row!.id;
}

/**
 * Delivers to a sink the messages queued since `after` for these addresses, and only those: the
 * other suites share the outbox, and each of their steps mails everyone in a role.
 */
export async function deliverMailSince(sequelize: Sequelize, port: number, after: string, addresses: string[]) {
  const ids = await sequelize.query<{ id: string }>(
    'SELECT id::text AS id FROM mail_outbox WHERE id > CAST(:after AS bigint) AND to_address IN (:addresses)',
    { type: QueryTypes.SELECT, replacements: { after, addresses } },
  );
  if (!ids.length) return;
  const worker = new MailWorker(sequelize, {
    smtp: { host: '127.0.0.1', port },
    from: 'Coretrail <coretrail@larkspur.example>',
    onlyIds: ids.map((r) => r.id),
  });
  await worker.drain();
  await worker.stop();
}
