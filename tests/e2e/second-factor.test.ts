import fs from 'node:fs';
import path from 'node:path';
import jsQR from 'jsqr';
import type { Browser, Page } from 'playwright-core';
import { PNG } from 'pngjs';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../../server/models/index.js';
import { TEST_PASSWORD, makeUser, unique } from '../support/app.js';
import { launch, nextCode, serveApp, type Served } from '../support/browser.js';

let served: Served;
let browser: Browser;
const shots = path.resolve('test-results/e2e');
const VIEWPORTS = [
  { width: 1024, height: 768 },
  { width: 1440, height: 900 },
];

beforeAll(async () => {
  served = await serveApp();
  browser = await launch();
  fs.mkdirSync(shots, { recursive: true });
});
afterAll(async () => {
  await browser?.close();
  await served?.close();
});

async function fillSignIn(page: Page, email: string) {
  await page.goto(`${served.base}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(TEST_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

/** Reads the QR code on screen as a phone's camera would: the otpauth:// address it carries. */
async function scanQr(page: Page): Promise<string> {
  const png = PNG.sync.read(await page.getByAltText('QR code to scan with an authenticator app').screenshot());
  const found = jsQR(new Uint8ClampedArray(png.data), png.width, png.height);
  if (!found) throw new Error('the QR code on screen did not decode');
  return found.data;
}

/** Every visible button and text box is at least 44 px tall (the floor screens' touch targets). */
async function smallTargets(page: Page): Promise<string[]> {
  return page.evaluate(() =>
    [...document.querySelectorAll('main button, main input:not([type=checkbox]), main a[class*="inline-flex"]')]
      .filter((e) => (e as HTMLElement).offsetParent !== null)
      .map((e) => ({ e, r: e.getBoundingClientRect() }))
      .filter(({ r }) => r.height < 44)
      .map(
        ({ e, r }) => `${e.tagName} "${(e.textContent ?? '').trim() || (e as HTMLInputElement).name}" ${r.height}px`,
      ),
  );
}

describe('a second factor, set up and used in a real browser', () => {
  for (const viewport of VIEWPORTS) {
    it(`at ${viewport.width}×${viewport.height}: an admin enrols with a phone-style code, signs out, and signs in with the code; a wrong code is refused in plain words`, async () => {
      const admin = await makeUser('admin', { name: unique('Admin ') });
      const context = await browser.newContext({ viewport });
      const page = await context.newPage();
      const tag = `${viewport.width}x${viewport.height}`;

      // the first sign-in lands on the set-up, not on the home page
      await fillSignIn(page, admin.email);
      await page.getByRole('heading', { level: 1, name: 'Set up your second factor' }).waitFor();
      await page.getByRole('button', { name: 'Show the QR code' }).click();
      const uri = await scanQr(page);
      expect(uri).toMatch(/^otpauth:\/\/totp\/Coretrail:/);
      const secret = new URL(uri).searchParams.get('secret')!;
      // the key typed by hand is the same secret, grouped in fours
      expect((await page.getByTestId('factor-secret').textContent())!.replace(/\s/g, '')).toBe(secret);
      await page.screenshot({ path: path.join(shots, `second-factor-enrol-${tag}.png`), fullPage: true });
      expect(await smallTargets(page)).toEqual([]);

      await page.getByLabel('Code from the app').fill(await nextCode(admin.email, secret));
      await page.getByRole('button', { name: 'Confirm' }).click();
      const codes = page.getByRole('list', { name: 'Recovery codes' }).getByRole('listitem');
      await codes.first().waitFor();
      expect(await codes.count()).toBe(10);
      await page.screenshot({ path: path.join(shots, `second-factor-codes-${tag}.png`), fullPage: true });
      await page.getByLabel('I have kept these codes somewhere safe').check();
      await page.getByRole('button', { name: 'Continue to Coretrail' }).click();
      await page.getByRole('heading', { level: 1, name: 'Administrator home' }).waitFor();

      await page.getByRole('button', { name: 'Sign out' }).click();
      await page.waitForURL(/\/sign-in/);

      // signing in again asks for the code; a wrong one is refused with a plain message
      await fillSignIn(page, admin.email);
      const code = page.getByLabel('Code from your authenticator app');
      await code.fill('000000');
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.getByText('That code is not right.').first().waitFor();
      expect(page.url()).toMatch(/\/sign-in/);
      await page.screenshot({ path: path.join(shots, `second-factor-wrong-code-${tag}.png`), fullPage: true });
      expect(await smallTargets(page)).toEqual([]);

      await code.fill(await nextCode(admin.email, secret));
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.getByRole('heading', { level: 1, name: 'Administrator home' }).waitFor();
      const events = await AuditEvent.findAll({ where: { entity: 'user', entityId: String(admin.id) } });
      expect(events.map((e) => e.action)).toContain('user.second_factor_enrolled');
      await context.close();
    });
  }

  it('when an operator is locked out, then an admin sees it on the people page and lifts it', async () => {
    const admin = await makeUser('admin', { name: unique('Admin ') });
    const operator = await makeUser('operator', { name: unique('Locked Operator ') });
    const context = await browser.newContext({ viewport: VIEWPORTS[1] });
    const page = await context.newPage();
    await fillSignIn(page, admin.email);
    await page.getByRole('button', { name: 'Show the QR code' }).click();
    const secret = new URL(await scanQr(page)).searchParams.get('secret')!;
    await page.getByLabel('Code from the app').fill(await nextCode(admin.email, secret));
    await page.getByRole('button', { name: 'Confirm' }).click();
    await page.getByLabel('I have kept these codes somewhere safe').check();
    await page.getByRole('button', { name: 'Continue to Coretrail' }).click();
    await page.getByRole('heading', { level: 1, name: 'Administrator home' }).waitFor();

    // the tablets mistype the shared password until the account locks
    const login = (password: string) =>
      request(served.t.app).post('/api/auth/login').send({ email: operator.email, password });
    for (let i = 0; i < served.t.config.LOGIN_LIMIT_PER_ACCOUNT; i++) {
      expect((await login('not the password')).status).toBe(401);
    }
    expect((await login(TEST_PASSWORD)).status).toBe(429);

    await page.goto(`${served.base}/admin/people`);
    const lift = page.getByRole('button', { name: `Lift the lock-out of ${operator.name}` });
    await lift.waitFor();
    await page.screenshot({ path: path.join(shots, 'lockout-people-page-1440x900.png') });
    await lift.click();
    await expect(lift.waitFor({ state: 'detached' })).resolves.toBeUndefined();
    expect((await login(TEST_PASSWORD)).status).toBe(200);
    const lifted = await AuditEvent.count({ where: { action: 'user.lockout_lifted', entityId: String(operator.id) } });
    expect(lifted).toBe(1);
    await context.close();
  });

  it('when an operator opens the account page on a tablet, then sessions and "sign out everywhere else" have 44 px targets', async () => {
    const operator = await makeUser('operator');
    const other = await browser.newContext({ viewport: VIEWPORTS[0] });
    await fillSignIn(await other.newPage(), operator.email);
    // a tablet: a touch screen, where every control is sized for a finger (pointer: coarse)
    const context = await browser.newContext({ viewport: VIEWPORTS[0], hasTouch: true });
    const page = await context.newPage();
    await fillSignIn(page, operator.email);
    await page.getByRole('heading', { level: 1, name: / home$/ }).waitFor();
    await page.goto(`${served.base}/account`);
    const list = page.getByRole('list', { name: 'Your sessions' }).getByRole('listitem');
    await list.nth(1).waitFor();
    expect(await list.count()).toBe(2);
    await page.screenshot({ path: path.join(shots, 'account-sessions-1024x768.png'), fullPage: true });
    const button = page.getByRole('button', { name: 'Sign out everywhere else' });
    expect((await button.boundingBox())!.height).toBeGreaterThanOrEqual(44);
    await button.click();
    await page.getByText('One other session ended.').waitFor();
    expect(await list.count()).toBe(1);
    await other.close();
    await context.close();
  });
});
