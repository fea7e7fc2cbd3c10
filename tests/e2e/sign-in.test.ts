import fs from 'node:fs';
import path from 'node:path';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_USERS } from '../../db/seeders/plant.js';
import { ROLE_LABELS } from '../../shared/roles.js';
import { givenSecondFactor, launch, nextCode, serveApp, type Served } from '../support/browser.js';

let served: Served;
let base: string;
let browser: Browser;
const shots = path.resolve('test-results/e2e');

beforeAll(async () => {
  served = await serveApp();
  base = served.base;
  browser = await launch();
  fs.mkdirSync(shots, { recursive: true });
});
afterAll(async () => {
  await browser?.close();
  await served?.close();
});

describe('signing in in a real browser', () => {
  for (const demo of DEMO_USERS) {
    it(`when ${demo.role} signs in, then they land on the ${ROLE_LABELS[demo.role]} home`, async () => {
      const context = await browser.newContext({ viewport: { width: 1024, height: 768 } });
      const page = await context.newPage();
      const problems: string[] = [];
      // the first visit asks who is signed in and gets a 200 either way: no 401 in the console from
      // it; the one expected is the sign-in's own "code required" for an administrator
      page.on('console', (m) => {
        const codeAsked = demo.role === 'admin' && m.location().url.endsWith('/api/auth/login');
        if (m.type() === 'error' && !codeAsked) problems.push(m.text());
      });
      // administrators sign in with a second factor (tests/e2e/second-factor.test.ts enrols one)
      if (demo.role === 'admin') await givenSecondFactor(demo.email, served.t.config);
      page.on('requestfailed', (r) => problems.push(`failed: ${r.url()}`));
      await page.goto(`${base}/`);
      await page.waitForURL(/\/sign-in/);
      await page.getByLabel('E-mail').fill(demo.email);
      await page.getByLabel('Password').fill(demo.password);
      await page.getByRole('button', { name: 'Sign in' }).click();
      if (demo.role === 'admin') {
        await page.getByLabel('Code from your authenticator app').fill(await nextCode(demo.email));
        await page.getByRole('button', { name: 'Sign in' }).click();
      }
      await expect(
        page.getByRole('heading', { level: 1, name: `${ROLE_LABELS[demo.role]} home` }).waitFor(),
      ).resolves.toBeUndefined();
      await page.screenshot({ path: path.join(shots, `home-${demo.role}.png`) });
      // nothing came from outside this origin, and the page logged no errors (CSP included)
      expect(problems).toEqual([]);
      await page.getByRole('button', { name: 'Sign out' }).click();
      await page.waitForURL(/\/sign-in/);
      await context.close();
    });
  }

  it('when the password is wrong, then the page says so and stays on sign-in', async () => {
    const page = await browser.newPage();
    await page.goto(`${base}/sign-in`);
    await page.getByLabel('E-mail').fill(DEMO_USERS[0]!.email);
    await page.getByLabel('Password').fill('not the password at all');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByText('That e-mail and password do not match an active account.').waitFor();
    expect(page.url()).toMatch(/\/sign-in/);
    await page.close();
  });
});
