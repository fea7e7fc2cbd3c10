import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { Op } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_USERS } from '../../db/seeders/plant.js';
import request from 'supertest';
import { Characteristic, Item, StageResult, Stage, User } from '../../server/models/index.js';
import { cookieFor, makeUser, TEST_PASSWORD } from '../support/app.js';
import { launch, serveApp, signIn, type Served } from '../support/browser.js';
import { formFor, passThrough, tornDownCore } from '../support/parts.js';
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

async function scan(page: Page, serial: string, stage = 'Block clean') {
  const box = page.getByRole('textbox', { name: 'Serial' });
  await box.fill(serial);
  await box.press('Enter');
  // this part's form, not the one before it
  await page.getByRole('form', { name: `${stage} readings for ${serial}` }).waitFor();
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

  it('when quality approves a stricter rule while the tablet is offline, then on reconnect the server judges by it, the screen says plainly which result it failed, each keeps the time it was taken on the tablet, and a part looked at before opens from the cache after a reload with no network', async () => {
    const blocks: string[] = [];
    for (let i = 0; i < 3; i++) {
      const b = (await tornDownCore(served.t, cookies, 'TARN-6')).block;
      await passThrough(served.t, cookies.operator, ['CLN-1', 'MPI-1'], b);
      blocks.push(b);
    }
    // [0] is read well above any limit, [1] at the form's passing value, [2] only looked at
    const [high, middling, lookedAt] = blocks as [string, string, string];
    const form = await formFor(served.t, cookies.operator, 'PT-1', high);
    const pressure = form.characteristics.find((c) => c.code === 'test-pressure')!;
    const pressureBox = `${pressure.name}, ${pressure.positions[0]!.label}`;
    // the seeded rule is a minimum of 40 psi (db/seeders/spec-book.ts); fillPassing types 40 + 10 = 50
    expect(pressure.rule).toMatchObject({ limitType: 'min', lowerLimit: 40 });
    const stage = await Stage.findOne({ where: { code: 'block-pressure' } });
    const char = (await Characteristic.findOne({ where: { stageId: stage!.id, code: 'test-pressure' } }))!;
    const author = await cookieFor(await makeUser('quality'), served.t.config);
    const approver = await cookieFor(await makeUser('quality'), served.t.config);
    const approveMinimum = async (lowerLimit: number, reason: string) => {
      const draft = await request(served.t.app)
        .post('/api/spec/rules')
        .set('Cookie', author)
        .send({ family: 'TARN-6', characteristicId: char.id, limits: { limitType: 'min', lowerLimit, resolution: 1 } });
      expect(draft.status).toBe(201);
      const approved = await request(served.t.app)
        .post(`/api/spec/rules/${draft.body.id}/approve`)
        .set('Cookie', approver)
        .send({ reason, password: TEST_PASSWORD });
      expect(approved.status).toBe(200);
    };

    const op = demo('operator');
    const context = await browser.newContext({ viewport: { width: 1024, height: 768 }, hasTouch: true });
    const page = await context.newPage();
    await signIn(page, served.base, op.email, op.password);
    await page.goto(`${served.base}/station`);
    await chooseStation(page, 'PT-1');
    for (const b of blocks) await scan(page, b, form.stage.name);
    await page.evaluate(() => navigator.serviceWorker.ready.then(() => true));

    await context.setOffline(true);
    const takenBetween: [number, number][] = [];
    let tightened = false;
    try {
      for (const [b, psi] of [
        [high, '60'],
        [middling, null],
      ] as const) {
        await scan(page, b, form.stage.name);
        await fillPassing(page, form);
        if (psi) await page.getByRole('textbox', { name: pressureBox, exact: true }).fill(psi);
        const before = Date.now();
        await recordButton(page).click();
        await page.getByRole('heading', { level: 2, name: 'Waiting to be sent', exact: true }).waitFor();
        takenBetween.push([before, Date.now()]);
        // the tablet judged it by the rule it had: a pass
        await expect(page.getByText('The tablet judged it passed').isVisible()).resolves.toBe(true);
        await page.getByRole('button', { name: 'Next part' }).click();
      }
      await page.getByRole('heading', { name: '2 results waiting to be sent' }).waitFor();

      // meanwhile, in the office: a minimum of 55 psi, drafted by one engineer and signed by another
      await approveMinimum(55, 'Water jackets tested at the engine maker’s pressure (test)');
      tightened = true;
      // a few minutes pass on the floor before the network returns
      await page.waitForTimeout(1_500);
      const online = Date.now();
      await context.setOffline(false);
      await page.getByRole('region', { name: /waiting to be sent/ }).waitFor({ state: 'detached', timeout: 20_000 });

      // said plainly, at the top of the screen, for the one whose verdict changed
      const notice = page
        .getByRole('alert')
        .filter({ hasText: `${middling}: the server judged it failed, not passed` });
      await notice.waitFor();
      await expect(notice.textContent()).resolves.toMatch(/rules changed while this tablet was offline/);
      // and why: the reading the new rule refuses
      await expect(notice.getByRole('listitem').allTextContents()).resolves.toEqual([
        expect.stringMatching(new RegExp(`^${pressure.name}, .*55`)),
      ]);
      await expect(page.getByText(`${high}: the server judged it`).count()).resolves.toBe(0);
      await page.screenshot({ path: path.join(shots, 'station-offline-verdict-differs-1024.png') });

      const items = await Item.findAll({ where: { serial: { [Op.in]: [high, middling] } } });
      const stageRow = (await Stage.findOne({ where: { code: 'block-pressure' } }))!;
      const rows = await StageResult.findAll({
        where: { itemId: { [Op.in]: items.map((i) => i.id) }, stageId: stageRow.id },
        order: [['id', 'ASC']],
      });
      const serialOf = new Map(items.map((i) => [i.id, i.serial]));
      expect(rows.map((r) => [serialOf.get(r.itemId), r.verdict])).toEqual([
        [high, 'pass'],
        [middling, 'fail'],
      ]);
      // each keeps the moment it was recorded on the tablet, not the moment it reached the server
      rows.forEach((r, i) => {
        const [from, to] = takenBetween[i]!;
        expect(r.takenAt!.getTime()).toBeGreaterThanOrEqual(from);
        expect(r.takenAt!.getTime()).toBeLessThanOrEqual(to);
        expect(r.finishedAt.getTime()).toBeGreaterThanOrEqual(online);
      });
      await notice.getByRole('button', { name: 'Seen' }).click();
      await notice.waitFor({ state: 'detached' });

      // a reload with no network: the part looked at earlier opens from what the tablet kept
      await context.setOffline(true);
      await page.reload();
      await page.getByRole('textbox', { name: 'Serial' }).waitFor();
      await scan(page, lookedAt, form.stage.name);
      await expect(page.getByRole('textbox', { name: pressureBox, exact: true }).isVisible()).resolves.toBe(true);
      await page.screenshot({ path: path.join(shots, 'station-offline-reload-part-1024.png') });
    } finally {
      // the demo plant's rule back as it was, for the files that run after this one
      if (tightened) await approveMinimum(40, 'Back to the demo plant’s minimum after the offline test');
      await context.close();
    }
  });
});
