import type { Server } from 'node:http';
import path from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';
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

/** The real app, client included, on a free loopback port. */
export async function serveApp(): Promise<Served> {
  const t = makeTestApp({ CLIENT_DIR: process.env.CLIENT_DIR ?? path.resolve('dist') });
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

export async function signIn(page: Page, base: string, email: string, password: string) {
  await page.goto(`${base}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByRole('heading', { level: 1, name: / home$/ }).waitFor();
}
