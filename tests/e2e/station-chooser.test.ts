import fs from 'node:fs';
import path from 'node:path';
import AxeBuilder from '@axe-core/playwright';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_USERS } from '../../db/seeders/plant.js';
import { launch, serveApp, signIn, type Served } from '../support/browser.js';

let served: Served;
let browser: Browser;
const shots = path.resolve('test-results/e2e');
const demo = (role: string) => DEMO_USERS.find((u) => u.role === role)!;

beforeAll(async () => {
  served = await serveApp();
  browser = await launch();
  fs.mkdirSync(shots, { recursive: true });
});
afterAll(async () => {
  await browser?.close();
  await served?.close();
});

describe('the station chooser on a tablet', () => {
  it('when a tablet has no station yet, then stations are large tiles by area in route order, each with its queue, and one tap chooses', async () => {
    const context = await browser.newContext({ viewport: { width: 1024, height: 768 }, hasTouch: true });
    const page = await context.newPage();
    const op = demo('operator');
    await signIn(page, served.base, op.email, op.password);
    await page.goto(`${served.base}/station`);
    await page.getByRole('heading', { name: "Choose this tablet's station" }).waitFor();
    await page
      .getByText(/\d+ waiting/)
      .first()
      .waitFor();

    // areas in the order a block meets them (db/seeders/plant.ts): the dock's bay, the cleaning bay, the machine shop
    const areas = await page.locator('section h3').allTextContents();
    expect(areas.indexOf('Bay A')).toBeLessThan(areas.indexOf('Bay B'));
    expect(areas.indexOf('Bay B')).toBeLessThan(areas.indexOf('Machine shop'));
    const tiles = page.getByRole('button', { name: /waiting/ });
    const count = await tiles.count();
    expect(count).toBeGreaterThan(10);
    // every tile at least the project's 48 px touch floor each way (src/README.md, floor density)
    for (let i = 0; i < count; i++) {
      const box = (await tiles.nth(i).boundingBox())!;
      expect(box.height).toBeGreaterThanOrEqual(48);
      expect(box.width).toBeGreaterThanOrEqual(48);
    }
    const axe = await new AxeBuilder({ page }).options({ rules: { 'target-size': { enabled: true } } }).analyze();
    const serious = axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
    expect(serious.map((v) => `${v.id}: ${v.nodes.length}`)).toEqual([]);
    await page.screenshot({ path: path.join(shots, 'station-chooser-1024.png') });

    await page.getByRole('button', { name: /\bBH-1\b/ }).click();
    await page.getByRole('heading', { level: 1, name: 'Bore and hone cell' }).waitFor();
    await context.close();
  });
});
