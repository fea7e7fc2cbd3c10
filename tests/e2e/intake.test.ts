import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_USERS } from '../../db/seeders/plant.js';
import { parseSerial } from '../../shared/domain/serial.js';
import { Customer, EngineFamily, Item, LabelPrint } from '../../server/models/index.js';
import { cookieFor, makeUser, unique } from '../support/app.js';
import { launch, serveApp, signIn, type Served } from '../support/browser.js';
import { pngImage } from '../support/images.js';
import { pngToY4m } from '../support/y4m.js';

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

/** window.print() would open a dialog; count the calls instead. */
async function stubPrint(page: Page) {
  await page.addInitScript(() => {
    (window as unknown as { printed: number }).printed = 0;
    window.print = () => {
      (window as unknown as { printed: number }).printed += 1;
      // the browser reports the print dialog closed, as Chromium does after a print or a cancel
      window.dispatchEvent(new Event('afterprint'));
    };
  });
}

async function labelPrints(serials: string[]) {
  const items = await Item.findAll({ where: { serial: serials } });
  return LabelPrint.count({ where: { itemId: items.map((i) => i.id) } });
}

describe('the receiving desk in a tablet browser', () => {
  it("receives a V8 core with two photos, prints its label, tears it down and prints the parts' labels", async () => {
    const context = await browser.newContext({ viewport: { width: 1024, height: 768 } });
    const page = await context.newPage();
    await stubPrint(page);
    const r = demo('receiving');
    await signIn(page, served.base, r.email, r.password);

    // 1. receive the core
    const v8 = (await EngineFamily.findOne({ where: { code: 'CORRIE-8' } }))!;
    const customer = (await Customer.findOne({ order: [['id', 'ASC']] }))!;
    await page.goto(`${served.base}/intake/new`);
    await page.getByLabel('Engine family').selectOption(String(v8.id));
    await page.getByLabel('Casting number', { exact: true }).fill('CV8 4471-B');
    const idNumber = unique('E2E').toUpperCase();
    await page.getByLabel('ID number').fill(idNumber);
    await page.getByLabel('Customer', { exact: true }).selectOption(String(customer.id));
    await page.getByLabel('Return reference').fill(unique('RMA-'));
    await page.getByLabel('Core credit').selectOption('full');
    await page.getByLabel('Grade').selectOption('sound');
    await page.getByRole('radio', { name: 'Accept' }).check();
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'coretrail-photos-'));
    const photos = ['front.png', 'back.png'].map((n) => {
      fs.writeFileSync(path.join(dir, n), pngImage());
      return path.join(dir, n);
    });
    await page.getByLabel('Photos').setInputFiles(photos);
    await expect.poll(() => page.locator('img[src^="/api/attachments/"]').count(), { timeout: 15_000 }).toBe(2);
    await page.getByRole('button', { name: 'Receive core' }).click();
    await page.waitForURL(/\/cores\/CR-/);
    const coreSerial = decodeURIComponent(page.url().split('/cores/')[1]!.split(/[?#]/)[0]!);
    expect(parseSerial(coreSerial)).toMatchObject({ ok: true, kind: 'core' });
    await expect.poll(() => page.locator('img[src^="/api/attachments/"]').count()).toBe(2);
    await page.screenshot({ path: path.join(shots, 'intake-core-page.png') });

    // 2. print its label
    await page
      .getByRole('link', { name: 'Print label' })
      .or(page.getByRole('button', { name: 'Print label' }))
      .first()
      .click();
    await page.waitForURL(/\/labels\?/);
    await page.locator(`img[src="/api/items/${coreSerial}/label.svg"]`).waitFor();
    await page.screenshot({ path: path.join(shots, 'intake-label-page.png') });
    await page.getByRole('button', { name: 'Print', exact: true }).click();
    await expect.poll(() => page.evaluate(() => (window as unknown as { printed: number }).printed)).toBe(1);
    // nothing is logged until the person says the labels came out
    await page.getByText('Did the labels come out of the printer?').waitFor();
    expect(await labelPrints([coreSerial])).toBe(0);
    await page.getByRole('button', { name: 'No, nothing printed' }).click();
    expect(await labelPrints([coreSerial])).toBe(0);
    await page.getByRole('button', { name: 'Print', exact: true }).click();
    await page.getByRole('button', { name: 'Yes, log the print' }).click();
    await page.getByText('Print logged').waitFor();
    expect(await labelPrints([coreSerial])).toBe(1);

    // 3. tear it down into a block, a crankshaft and two heads
    await page.goto(`${served.base}/teardown`);
    await page.getByLabel('Serial').fill(coreSerial);
    await page.getByLabel('Serial').press('Enter');
    for (const name of ['Keep Block', 'Keep Crankshaft', 'Keep Cylinder head (left)', 'Keep Cylinder head (right)']) {
      await page.getByRole('radio', { name }).or(page.getByRole('button', { name })).first().click();
    }
    await page.screenshot({ path: path.join(shots, 'teardown-form.png') });
    await page.getByRole('button', { name: 'Record teardown' }).click();
    await page
      .getByRole('button', { name: 'Print labels for these parts' })
      .or(page.getByRole('link', { name: 'Print labels for these parts' }))
      .first()
      .waitFor();
    const core = (await Item.findOne({ where: { serial: coreSerial } }))!;
    expect(core.status).toBe('torn_down');
    const res = await request(served.t.app)
      .get(`/api/cores/${coreSerial}`)
      .set('Cookie', await cookieFor(await makeUser('receiving'), served.t.config));
    const parts: string[] = res.body.parts.map((p: { serial: string }) => p.serial);
    expect(res.body.parts.map((p: { kind: string }) => p.kind).sort()).toEqual([
      'block',
      'crankshaft',
      'cylinder_head',
      'cylinder_head',
    ]);
    for (const s of parts) await page.getByText(s).first().waitFor();
    await page.screenshot({ path: path.join(shots, 'teardown-done.png') });

    // 4. print the parts' labels
    await page
      .getByRole('button', { name: 'Print labels for these parts' })
      .or(page.getByRole('link', { name: 'Print labels for these parts' }))
      .first()
      .click();
    await page.waitForURL(/\/labels\?/);
    for (const s of parts) await page.locator(`img[src="/api/items/${s}/label.svg"]`).waitFor();
    await page.getByRole('button', { name: 'Print', exact: true }).click();
    await expect.poll(() => page.evaluate(() => (window as unknown as { printed: number }).printed)).toBe(1);
    await page.getByRole('button', { name: 'Yes, log the print' }).click();
    await page.getByText('Print logged').waitFor();
    expect(await labelPrints(parts)).toBe(4);
    await page.screenshot({ path: path.join(shots, 'teardown-labels.png') });
    await context.close();
  });
});

describe('the scan box with a real (fake) camera', () => {
  it("reads a label's QR from the camera and opens the item", async () => {
    const cookie = await cookieFor(await makeUser('receiving'), served.t.config);
    const v8 = (await EngineFamily.findOne({ where: { code: 'CORRIE-8' } }))!;
    const customer = (await Customer.findOne())!;
    const created = await request(served.t.app)
      .post('/api/cores')
      .set('Cookie', cookie)
      .send({
        familyId: v8.id,
        castingNumber: 'CV8 4471-B',
        idNumber: unique('CAM').toUpperCase(),
        source: 'customer_return',
        customerId: customer.id,
        sourceReference: unique('RMA-'),
        receivedOn: new Date().toISOString().slice(0, 10),
        complete: true,
        grade: 'sound',
        accepted: true,
        creditDecision: 'full',
      });
    expect(created.status).toBe(201);
    const serial = created.body.serial as string;
    const png = await request(served.t.app).get(`/api/items/${serial}/label.png`).set('Cookie', cookie).buffer(true);
    const video = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'coretrail-cam-')), 'label.y4m');
    fs.writeFileSync(video, pngToY4m(png.body as Buffer));

    const camBrowser = await launch([
      '--use-fake-ui-for-media-stream',
      '--use-fake-device-for-media-stream',
      `--use-file-for-fake-video-capture=${video}`,
    ]);
    try {
      const page = await camBrowser.newPage({ viewport: { width: 1024, height: 768 } });
      const r = demo('receiving');
      await signIn(page, served.base, r.email, r.password);
      await page.goto(`${served.base}/teardown`);
      await page.getByRole('button', { name: 'Scan with camera' }).click();
      await page.getByText(serial).first().waitFor({ timeout: 30_000 });
      await page.screenshot({ path: path.join(shots, 'camera-scan.png') });
    } finally {
      await camBrowser.close();
    }
  });
});
