import fs from 'node:fs';
import path from 'node:path';
import AxeBuilder from '@axe-core/playwright';
import bcrypt from 'bcryptjs';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, Item, StageResult } from '../../server/models/index.js';
import { cookieFor, makeUser, qualify, unique } from '../support/app.js';
import { launch, serveApp, type Served } from '../support/browser.js';
import { formFor, plantToday, tornDownCore } from '../support/parts.js';
import { fillPassing } from '../support/station-ui.js';

/**
 * One shared tablet at the block clean station, enrolled by an admin. Two operators take turns on
 * it by badge and PIN; each reading is stored under the person who took it, with the tablet beside
 * them. An operator never signed off for the stage, and one whose sign-off ran out, are refused.
 */

let served: Served;
let browser: Browser;
let cookies: { receiving: string; operator: string };
let tabletCookie: { name: string; value: string };
let tabletId: number;
const shots = path.resolve('test-results/e2e');

beforeAll(async () => {
  served = await serveApp();
  browser = await launch();
  fs.mkdirSync(shots, { recursive: true });
  cookies = {
    receiving: await cookieFor(await makeUser('receiving'), served.t.config),
    operator: await cookieFor(await makeUser('operator'), served.t.config),
  };
  const admin = await cookieFor(await makeUser('admin'), served.t.config);
  const enrol = await request(served.t.app)
    .post('/api/tablets')
    .set('Cookie', admin)
    .send({ station: 'CLN-1', label: unique('Clean bay ') });
  if (enrol.status !== 201) throw new Error(`enrol failed: ${JSON.stringify(enrol.body)}`);
  tabletId = enrol.body.id;
  const raw = (enrol.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('coretrail_tablet='))!;
  const [name, value] = raw.split(';')[0]!.split('=') as [string, string];
  tabletCookie = { name, value };
}, 60_000);
afterAll(async () => {
  await browser?.close();
  await served?.close();
});

/** An operator with a badge and a PIN; `qualified: false` for one never signed off. */
async function badged(name: string, extra: { qualified?: boolean } = {}) {
  const user = await makeUser('operator', { name, ...extra });
  const badge = unique('B').toUpperCase();
  const pin = String(Math.floor(100000 + Math.random() * 899999));
  await user.update({ badge, pinHash: await bcrypt.hash(pin, 4) });
  return { user, badge, pin };
}

async function tabletPage(): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ viewport: { width: 1024, height: 768 }, hasTouch: true });
  await context.addCookies([{ ...tabletCookie, url: served.base }]);
  const page = await context.newPage();
  await page.goto(`${served.base}/tablet`);
  await page.getByRole('heading', { level: 1, name: 'Block thermal clean' }).waitFor();
  return { context, page };
}

async function identify(page: Page, who: { badge: string; pin: string }) {
  await page.getByLabel('Badge').fill(who.badge);
  await page.getByLabel('PIN').fill(who.pin);
  await page.getByRole('button', { name: 'That’s me' }).click();
  await page.getByText(`Recording as badge ${who.badge}`).waitFor();
}

async function scanAndFill(page: Page, serial: string) {
  const box = page.getByRole('textbox', { name: 'Serial' });
  await box.fill(serial);
  await box.press('Enter');
  await fillPassing(page, await formFor(served.t, cookies.operator, 'CLN-1', serial));
}

const block = async () => (await tornDownCore(served.t, cookies, 'TARN-6')).block;
const day = (n: number) =>
  new Date(Date.parse(`${plantToday()}T00:00:00Z`) + n * 86_400_000).toISOString().slice(0, 10);

describe('a shared tablet at a station', () => {
  it('when two operators take turns by badge and PIN, then each reading is stored under the person who took it, with the tablet', async () => {
    const ana = await badged('Ana Turner');
    const ben = await badged('Ben Ortiz');
    const [first, second] = [await block(), await block()];
    const { context, page } = await tabletPage();

    for (const [serial, who] of [
      [first, ana],
      [second, ben],
    ] as const) {
      if (who === ana) {
        // a mistyped PIN: refused in plain words, nothing stored, and the tablet asks for badge and PIN again
        await identify(page, { badge: who.badge, pin: who.pin === '482915' ? '482916' : '482915' });
        await scanAndFill(page, serial);
        await page.getByRole('button', { name: 'Record result' }).click();
        await page.getByText('That badge and PIN do not match anyone who may record here.').first().waitFor();
        await page.getByLabel('Badge').waitFor();
        expect(await StageResult.count({ where: { itemId: (await Item.findOne({ where: { serial } }))!.id } })).toBe(0);
        await identify(page, who);
      } else {
        await identify(page, who);
        await scanAndFill(page, serial);
      }
      await page.getByRole('button', { name: 'Record result' }).click();
      const passed = page.getByRole('status').filter({ has: page.getByRole('heading', { level: 2, name: 'Passed' }) });
      await passed.waitFor();
      await expect(passed.getByText(who.user.name).first().isVisible()).resolves.toBe(true);
      if (who === ana) await page.screenshot({ path: path.join(shots, 'tablet-passed-1024.png') });
      await page.getByRole('button', { name: 'Next part' }).click();
      // the identity lasted one result: the next person names themselves afresh
      await page.getByLabel('Badge').waitFor();
    }

    // the trail (an item's results, as the item page and the trail read them) names each person
    for (const [serial, who] of [
      [first, ana],
      [second, ben],
    ] as const) {
      const item = (await Item.findOne({ where: { serial } }))!;
      const results = await StageResult.findAll({ where: { itemId: item.id } });
      expect(results.map((r) => [r.operatorId, r.tabletId])).toEqual([[who.user.id, tabletId]]);
      const event = await AuditEvent.findOne({
        where: { action: 'result.recorded', entityId: String(results[0]!.id) },
      });
      expect(event!.actorId).toBe(who.user.id);
      expect(event!.after).toMatchObject({ tablet: { id: tabletId } });
      const history = await request(served.t.app).get(`/api/items/${serial}/results`).set('Cookie', cookies.operator);
      expect(history.body.map((r: { operator: string }) => r.operator)).toEqual([who.user.name]);
    }
    await context.close();
  });

  it('when an operator with no sign-off, then one whose sign-off ran out, try to record, then each is refused in plain words and nothing is stored', async () => {
    const una = await badged('Una Untrained', { qualified: false });
    const lars = await badged('Lars Lapsed', { qualified: false });
    await qualify(lars.user, { stages: ['block-clean'], trainedOn: day(-400), expiresOn: day(-1) });
    const serial = await block();
    const { context, page } = await tabletPage();

    await identify(page, una);
    await scanAndFill(page, serial);
    // the screen before any refusal: axe finds no serious problem, and every target is touch-sized
    const axe = await new AxeBuilder({ page }).options({ rules: { 'target-size': { enabled: true } } }).analyze();
    const serious = axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
    expect(serious.map((v) => `${v.id}: ${v.nodes.length}`)).toEqual([]);
    await page.getByRole('button', { name: 'Record result' }).click();
    await page
      .getByText('Una Untrained is not qualified to record Block clean: no sign-off is on file.')
      .first()
      .waitFor();
    await page.screenshot({ path: path.join(shots, 'tablet-not-qualified-1024.png') });

    await page.getByRole('button', { name: 'Not me' }).click();
    await identify(page, lars);
    await page.getByRole('button', { name: 'Record result' }).click();
    await page
      .getByText(`qualification to record Block clean expired on ${day(-1)}`)
      .first()
      .waitFor();

    const item = (await Item.findOne({ where: { serial } }))!;
    expect(await StageResult.count({ where: { itemId: item.id } })).toBe(0);
    await context.close();
  });
});
