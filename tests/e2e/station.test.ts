import { randomInt } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import AxeBuilder from '@axe-core/playwright';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_USERS } from '../../db/seeders/plant.js';
import { Item, Nonconformance, StageResult } from '../../server/models/index.js';
import { makeSerial } from '../../shared/domain/serial.js';
import { cookieFor, makeUser } from '../support/app.js';
import { chooseStation } from '../support/station-ui.js';
import { launch, serveApp, signIn, type Served } from '../support/browser.js';
import { formFor, passThrough, tornDownCore } from '../support/parts.js';

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

/** A Corrie V8 block that has passed every stage before bore and hone, made through the API. */
async function blockAtBoreHone() {
  const parts = await tornDownCore(served.t, cookies, 'CORRIE-8');
  await passThrough(served.t, cookies.operator, ['CLN-1', 'MPI-1', 'PT-1', 'LH-1'], parts.block);
  return parts.block;
}

async function scan(page: Page, serial: string) {
  const box = page.getByRole('textbox', { name: 'Serial' });
  await box.fill(serial);
  await box.press('Enter');
  await page.getByRole('textbox', { name: 'Cylinder bore diameter, Cylinder 1, top, thrust' }).waitFor();
}

/**
 * Types every bore reading (8 cylinders × 3 depths × 2 axes) and the finish, as an operator would,
 * after choosing the size class the block was bored to (0.030 in over unless told; none with null).
 */
async function typeBores(
  page: Page,
  odd?: { position: string; value: string },
  every = '4.0300',
  sizeClass: string | null = '+0.030',
) {
  if (sizeClass)
    await page
      .getByRole('combobox', { name: 'Cylinder bore diameter: size class finished to' })
      .selectOption(sizeClass);
  const depths = ['top', 'middle', 'bottom'];
  const axes = ['thrust', 'axial'];
  for (let c = 1; c <= 8; c++) {
    for (const d of depths) {
      for (const a of axes) {
        const label = `Cylinder ${c}, ${d}, ${a}`;
        const value = odd && odd.position === label ? odd.value : every;
        await page.getByRole('textbox', { name: `Cylinder bore diameter, ${label}`, exact: true }).fill(value);
      }
    }
  }
  await page.getByRole('textbox', { name: 'Bore surface finish Ra, Whole part' }).fill('25');
}

describe('the station screen on a tablet', () => {
  it('an out-of-tolerance bore turns red before submitting, fails, holds the block with an NCR; a good block moves on', async () => {
    const bad = await blockAtBoreHone();
    const good = await blockAtBoreHone();
    const context = await browser.newContext({ viewport: { width: 1024, height: 768 } });
    const page = await context.newPage();
    const op = demo('operator');
    await signIn(page, served.base, op.email, op.password);
    await page.goto(`${served.base}/station`);
    await chooseStation(page, 'BH-1');
    await page.getByRole('heading', { level: 1, name: 'Bore and hone cell' }).waitFor();

    await scan(page, bad);
    // the form opens on its first reading, focused and in view at 1024×768: the next touch is a reading
    const first = page.getByRole('textbox', { name: 'Cylinder bore diameter, Cylinder 1, top, thrust' });
    await expect(first.evaluate((el) => el === document.activeElement)).resolves.toBe(true);
    const at = (await first.boundingBox())!;
    expect(at.y).toBeGreaterThanOrEqual(0);
    expect(at.y + at.height).toBeLessThanOrEqual(768);
    // the hazard caution defers to the plant's own procedures
    const caution = page.getByRole('complementary', { name: 'Safety: Bore and hone' });
    await expect(caution.getByText(/Rotating cutters and hones/).isVisible()).resolves.toBe(true);
    // the form opened scrolled past it: the sticky bar repeats it in short until it is back in view
    const reminder = page.getByText(
      "Safety · Bore and hone: Rotating cutters and hones. Follow the plant's procedure.",
    );
    await reminder.waitFor();
    await caution.scrollIntoViewIfNeeded();
    await reminder.waitFor({ state: 'detached' });
    await first.scrollIntoViewIfNeeded();
    await typeBores(page, { position: 'Cylinder 6, middle, thrust', value: '4.0309' });
    const odd = page.getByRole('textbox', { name: 'Cylinder bore diameter, Cylinder 6, middle, thrust', exact: true });
    await expect(odd.getAttribute('aria-invalid')).resolves.toBe('true');
    const fine = page.getByRole('textbox', { name: 'Cylinder bore diameter, Cylinder 5, middle, thrust', exact: true });
    await expect(fine.getAttribute('aria-invalid')).resolves.not.toBe('true');
    await page.screenshot({ path: path.join(shots, 'station-typed-1024.png'), fullPage: false });
    // the station screen at tablet size: no serious or critical accessibility problems, target size included
    const axe = await new AxeBuilder({ page }).options({ rules: { 'target-size': { enabled: true } } }).analyze();
    const serious = axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
    expect(serious.map((v) => `${v.id}: ${v.nodes.length}`)).toEqual([]);

    await page.getByRole('button', { name: 'Record result' }).click();
    // a failing result is asked about once, in large type, before it opens an NCR
    const ask = page.getByRole('dialog', { name: '1 reading out of tolerance' });
    await ask.getByText(/Cylinder bore diameter · Cylinder 6, middle, thrust: 4\.0309 in/).waitFor();
    await page.screenshot({ path: path.join(shots, 'station-confirm-failure-1024.png') });
    // "Correct a reading" goes back to the box; nothing was recorded
    await ask.getByRole('button', { name: 'Correct a reading' }).click();
    await expect(page.getByRole('dialog').count()).resolves.toBe(0);
    expect((await Item.findOne({ where: { serial: bad } }))!.status).toBe('in_process');
    await page.getByRole('button', { name: 'Record result' }).click();
    await ask.getByRole('button', { name: 'Record the failure' }).click();
    const verdict = page.getByRole('status').filter({ has: page.getByRole('heading', { level: 2, name: 'Failed' }) });
    await verdict.waitFor();
    await expect(verdict.getByText('On hold').first().isVisible()).resolves.toBe(true);
    await page.screenshot({ path: path.join(shots, 'station-failed-1024.png') });
    const item = (await Item.findOne({ where: { serial: bad } }))!;
    expect(item.status).toBe('on_hold');
    const ncr = (await Nonconformance.findOne({ where: { itemId: item.id } }))!;
    expect(ncr.state).toBe('raised');
    expect(ncr.failing).toEqual([
      expect.objectContaining({ characteristic: 'bore', position: 'c6/middle/thrust', value: 4.0309 }),
    ]);
    await expect(verdict.getByText(ncr.number).first().isVisible()).resolves.toBe(true);

    await page.getByRole('button', { name: 'Next part' }).click();
    await page.getByRole('textbox', { name: 'Serial' }).waitFor();
    // one request answers a scan: the part's form, which names the item too (no item lookup first)
    const asked: string[] = [];
    const onRequest = (r: { url: () => string }) => {
      const u = new URL(r.url());
      if (u.pathname.startsWith('/api/')) asked.push(u.pathname);
    };
    page.on('request', onRequest);
    await scan(page, good);
    page.off('request', onRequest);
    expect(asked).toEqual(['/api/stations/BH-1/form']);
    await typeBores(page);
    await page.getByRole('button', { name: 'Record result' }).click();
    const passed = page.getByRole('status').filter({ has: page.getByRole('heading', { level: 2, name: 'Passed' }) });
    await passed.waitFor();
    await expect(passed.getByText('Next stage: Block deck resurface').isVisible()).resolves.toBe(true);
    expect((await Item.findOne({ where: { serial: good } }))!.status).toBe('in_process');
    await context.close();
  });

  it('when the operator chooses the size class the block was bored to, then the bores are judged to it and it is recorded', async () => {
    const block = await blockAtBoreHone();
    const context = await browser.newContext({ viewport: { width: 1024, height: 768 } });
    const page = await context.newPage();
    const op = demo('operator');
    await signIn(page, served.base, op.email, op.password);
    await page.goto(`${served.base}/station`);
    await chooseStation(page, 'BH-1');
    await scan(page, block);
    // bored 0.020 in over the 4.000 in standard: 4.0200 ± 0.0005 in for this class (spec-book.ts)
    await typeBores(page, undefined, '4.0200', null);
    const box = page.getByRole('textbox', { name: 'Cylinder bore diameter, Cylinder 1, top, thrust' });
    await expect(box.getAttribute('aria-invalid')).resolves.toBe('true');
    const choice = page.getByRole('combobox', { name: 'Cylinder bore diameter: size class finished to' });
    await choice.selectOption('+0.020');
    await expect(box.getAttribute('aria-invalid')).resolves.not.toBe('true');
    await page.getByRole('button', { name: 'Record result' }).click();
    const passed = page.getByRole('status').filter({ has: page.getByRole('heading', { level: 2, name: 'Passed' }) });
    await passed.waitFor();
    const item = (await Item.findOne({ where: { serial: block } }))!;
    const result = (await StageResult.findOne({ where: { itemId: item.id }, order: [['id', 'DESC']] }))!;
    expect(result.sizeClasses.bore).toMatchObject({ code: '+0.020', name: '0.020 in over' });
    await context.close();
  });

  it('is laid out for portrait too, and refuses a part that is not due, saying so plainly', async () => {
    const parts = await tornDownCore(served.t, cookies, 'CORRIE-8');
    const context = await browser.newContext({ viewport: { width: 768, height: 1024 } });
    const page = await context.newPage();
    const op = demo('operator');
    await signIn(page, served.base, op.email, op.password);
    await page.goto(`${served.base}/station`);
    await chooseStation(page, 'BH-1');
    const box = page.getByRole('textbox', { name: 'Serial' });
    // a well-formed serial that no item has is said under the box, and selected for the next scan
    const nobody = makeSerial('block', randomInt);
    await box.fill(nobody);
    await box.press('Enter');
    await page
      .getByRole('alert')
      .filter({ hasText: `No item has the serial ${nobody}` })
      .waitFor();
    await expect(box.evaluate((el: HTMLInputElement) => el.selectionEnd! - el.selectionStart!)).resolves.toBe(
      nobody.length,
    );
    await box.fill(parts.block);
    await box.press('Enter');
    const alert = page.getByRole('alert').filter({ hasText: 'its next stage is Block clean' });
    await alert.waitFor();
    await page.screenshot({ path: path.join(shots, 'station-refused-768.png') });
    // the form was never offered
    await expect(page.getByRole('button', { name: 'Record result' }).count()).resolves.toBe(0);
    const form = await formFor(served.t, cookies.operator, 'BH-1', parts.block);
    expect(form.sequence.ok).toBe(false);

    // portrait, with a part that is due: every control still at least 44 px
    const due = await blockAtBoreHone();
    await page.goto(`${served.base}/station?serial=${due}`);
    await page.getByRole('textbox', { name: 'Cylinder bore diameter, Cylinder 1, top, thrust' }).waitFor();
    await page.screenshot({ path: path.join(shots, 'station-portrait-768.png') });
    const small = await page.evaluate(
      () =>
        [...document.querySelectorAll('main input, main button, main select, main textarea')]
          .map((el) => el.getBoundingClientRect())
          .filter((r) => r.width > 1 && r.height > 1 && (r.width < 44 || r.height < 44)).length,
    );
    expect(small).toBe(0);
    await context.close();
  });
});
