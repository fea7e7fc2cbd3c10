import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { Op } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_USERS } from '../../db/seeders/plant.js';
import { Item, StageResult, User } from '../../server/models/index.js';
import { cookieFor, makeUser } from '../support/app.js';
import { launch, serveApp, signIn, type Served } from '../support/browser.js';
import { formFor, tornDownCore } from '../support/parts.js';
import { chooseStation, fillPassing } from '../support/station-ui.js';

let served: Served;
let browser: Browser;
let cookies: { receiving: string; operator: string };
const shots = path.resolve('test-results/e2e');
const demo = (role: string) => DEMO_USERS.find((u) => u.role === role)!;

beforeAll(async () => {
  served = await serveApp();
  browser = await launch();
  fs.mkdirSync(shots, { recursive: true });
  cookies = {
    receiving: await cookieFor(await makeUser('receiving'), served.t.config),
    operator: await cookieFor(await makeUser('operator'), served.t.config),
  };
});
afterAll(async () => {
  await browser?.close();
  await served?.close();
});

const recordButton = (page: Page) => page.getByRole('button', { name: 'Record result' });

async function scan(page: Page, serial: string) {
  const box = page.getByRole('textbox', { name: 'Serial' });
  await box.fill(serial);
  await box.press('Enter');
  // this part's form, not the one before it
  await page.getByRole('form', { name: `Block clean readings for ${serial}` }).waitFor();
}

async function resultsAtClean(serials: string[]) {
  const items = await Item.findAll({ where: { serial: { [Op.in]: serials } } });
  const rows = await StageResult.findAll({
    where: { itemId: { [Op.in]: items.map((i) => i.id) } },
    order: [['id', 'ASC']],
  });
  const serialOf = new Map(items.map((i) => [i.id, i.serial]));
  // CLN-1 is each block's first stage after teardown, so every result here is the station's
  return rows.map((r) => ({ serial: serialOf.get(r.itemId)!, operatorId: r.operatorId, verdict: r.verdict }));
}

describe('the station without a network', () => {
  it('when the network drops, then three results wait on the tablet in plain sight, and go out once each, in order, under the operator, when it returns', async () => {
    const blocks: string[] = [];
    for (let i = 0; i < 3; i++) blocks.push((await tornDownCore(served.t, cookies, 'TARN-6')).block);
    const form = await formFor(served.t, cookies.operator, 'CLN-1', blocks[0]!);
    const op = demo('operator');
    const operator = (await User.findOne({ where: { email: op.email } }))!;
    const context = await browser.newContext({ viewport: { width: 1024, height: 768 }, hasTouch: true });
    const page = await context.newPage();
    await signIn(page, served.base, op.email, op.password);
    await page.goto(`${served.base}/station`);
    await chooseStation(page, 'CLN-1');
    // the morning's parts are looked at while the network is up: their forms stay on the tablet
    for (const b of blocks) await scan(page, b);

    // the app shell is on the tablet (the service worker installed) before the network drops
    await page.evaluate(() => navigator.serviceWorker.ready.then(() => true));
    await context.setOffline(true);
    for (const [i, b] of blocks.entries()) {
      await scan(page, b);
      await fillPassing(page, form);
      await recordButton(page).click();
      await page.getByRole('heading', { level: 2, name: 'Waiting to be sent', exact: true }).waitFor();
      await page.getByRole('heading', { name: `${i + 1} ${i ? 'results' : 'result'} waiting to be sent` }).waitFor();
      if (i === blocks.length - 1) await page.screenshot({ path: path.join(shots, 'station-offline-queue-1024.png') });
      await page.getByRole('button', { name: 'Next part' }).click();
    }
    const list = page.getByRole('region', { name: '3 results waiting to be sent' }).getByRole('listitem');
    await expect(list.allTextContents()).resolves.toEqual(blocks.map((b) => expect.stringContaining(b)));
    // nothing reached the server while the tablet was offline
    await expect(resultsAtClean(blocks)).resolves.toEqual([]);

    await context.setOffline(false);
    await page.getByRole('region', { name: /waiting to be sent/ }).waitFor({ state: 'detached', timeout: 20_000 });
    const stored = await resultsAtClean(blocks);
    expect(stored).toEqual(blocks.map((serial) => ({ serial, operatorId: operator.id, verdict: 'pass' })));
    // nothing differed from what the tablet showed, so no notice asks for attention
    await expect(page.getByText(/the server judged it/).count()).resolves.toBe(0);

    // a reload with no network: the shell comes from the service worker, the station and its forms from IndexedDB
    await context.setOffline(true);
    await page.reload();
    await page.getByRole('heading', { level: 1, name: 'Block thermal clean' }).waitFor();
    await page.getByRole('textbox', { name: 'Serial' }).waitFor();
    await page.screenshot({ path: path.join(shots, 'station-offline-reload-1024.png') });
    await context.close();
  });
});
