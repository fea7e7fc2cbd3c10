import fs from 'node:fs';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import type { Browser, Page } from 'playwright-core';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nominalSizeClasses, passingReadings } from '../../db/seeders/sample-readings.js';
import { DEMO_USERS } from '../../db/seeders/plant.js';
import { Characteristic, EngineFamily, RuleRehearsal, Stage, ToleranceRule } from '../../server/models/index.js';
import { cookieFor, makeUser } from '../support/app.js';
import { launch, serveApp, signIn, type Served } from '../support/browser.js';
import { formFor, gaugesOf, passThrough, tornDownCore } from '../support/parts.js';

/**
 * Quality at the control charts: the six-cylinder's bore diameter over the last year (the demo's
 * history and whatever the other suites record), a block this test records high but in tolerance,
 * flagged on the chart; then a tighter draft rehearsed on the rule page, the block among the parts
 * that would fail, and approved by the second quality engineer with the rehearsal kept.
 */

let served: Served;
let browser: Browser;
let cookies: { receiving: string; operator: string };
let planted: string;
let boreId: number;
const shots = path.resolve('test-results/e2e');
const demo = DEMO_USERS.filter((u) => u.role === 'quality');

beforeAll(async () => {
  served = await serveApp();
  browser = await launch();
  fs.mkdirSync(shots, { recursive: true });
  cookies = {
    receiving: await cookieFor(await makeUser('receiving'), served.t.config),
    operator: await cookieFor(await makeUser('operator'), served.t.config),
  };
  const stage = (await Stage.findOne({ where: { code: 'bore-hone' } }))!;
  boreId = (await Characteristic.findOne({ where: { stageId: stage.id, code: 'bore' } }))!.id;
  // TARN-6 bores are 3.7205 ± 0.0005 in: 3.7209 passes, but no block of the history is near it
  const parts = await tornDownCore(served.t, cookies, 'TARN-6');
  await passThrough(served.t, cookies.operator, ['CLN-1', 'MPI-1', 'PT-1', 'LH-1'], parts.block);
  const form = await formFor(served.t, cookies.operator, 'BH-1', parts.block);
  const res = await request(served.t.app)
    .post('/api/results')
    .set('Cookie', cookies.operator)
    .send({
      idempotencyKey: randomUUID(),
      serial: parts.block,
      station: 'BH-1',
      ...gaugesOf(form),
      readings: passingReadings(form, (c, _p, v) => (c === 'bore' ? 3.7209 : v)),
      sizeClasses: nominalSizeClasses(form),
    });
  if (res.status !== 201 || res.body.verdict !== 'pass') throw new Error(JSON.stringify(res.body));
  planted = parts.block;
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await served?.close();
});

async function openChart(page: Page) {
  await page.getByRole('navigation').getByRole('link', { name: 'Control charts' }).click();
  await page.getByRole('heading', { level: 1, name: 'Control charts and capability' }).waitFor();
  await page.getByLabel('Engine family').selectOption('TARN-6');
  await page.waitForURL(/family=TARN-6/);
  await expect(page.getByLabel('Characteristic').inputValue()).resolves.toBe(String(boreId));
  await page.getByRole('heading', { name: 'Part means and within-part spread chart' }).waitFor();
}

describe('control charts and rule rehearsal in the browser', () => {
  it('quality sees the planted block flagged on the bore chart, with capability, and each chart’s numbers a click away', async () => {
    for (const [width, height] of [
      [1440, 900],
      [1024, 768],
    ] as const) {
      const context = await browser.newContext({ viewport: { width, height } });
      const page = await context.newPage();
      await signIn(page, served.base, demo[0]!.email, demo[0]!.password);
      await openChart(page);
      const signals = page.getByRole('region', { name: 'Signals on these charts' });
      const row = signals.getByRole('row').filter({ hasText: planted });
      await row.first().waitFor();
      // rule 1 on the part means: 3.7209 is far above the upper control limit
      await expect(row.filter({ hasText: 'Part mean' }).first().textContent()).resolves.toMatch(/Rule 1/);
      await expect(page.getByText('Capability', { exact: true }).first().isVisible()).resolves.toBe(true);
      await expect(page.getByRole('img', { name: /Histogram of \d+ readings/ }).isVisible()).resolves.toBe(true);
      await expect(
        page
          .getByText(/normality check|Normality/)
          .first()
          .isVisible(),
      ).resolves.toBe(true);
      await page.screenshot({ path: path.join(shots, `spc-chart-${width}.png`), fullPage: width === 1440 });
      if (width === 1024) {
        // touch targets on the office screen: the filters and the buttons under a chart are 44 px or more
        for (const control of [
          page.getByLabel('Engine family'),
          page.getByRole('button', { name: 'Show the numbers' }).first(),
        ]) {
          const box = (await control.boundingBox())!;
          expect(box.height).toBeGreaterThanOrEqual(44);
        }
      }
      // the numbers of the part-mean chart: the planted block's row, with its value
      const first = page.getByRole('button', { name: 'Show the numbers' }).first();
      await first.click();
      const table = page.getByRole('region', { name: 'Part mean: the numbers' });
      await expect(table.getByRole('row').filter({ hasText: planted }).first().textContent()).resolves.toContain(
        '3.72090',
      );
      const download = page.waitForEvent('download');
      await page.getByRole('button', { name: 'Download CSV' }).first().click();
      const csv = fs.readFileSync((await (await download).path())!, 'utf8');
      // the shared writer (shared/csv.ts): byte-order mark first, a field quoted only when it must be
      expect(csv.split('\r\n')[0]).toMatch(/^\ufeffPoint,Serial,Recorded/);
      expect(csv).toContain(planted);
      await context.close();
    }
  });

  it('quality rehearses a tighter draft, sees the planted block among the parts that would fail, and the second quality engineer approves it with the rehearsal kept', async () => {
    const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    const page = await context.newPage();
    await signIn(page, served.base, demo[0]!.email, demo[0]!.password);
    await page.goto(`${served.base}/spec/TARN-6/${boreId}`);
    await page.getByRole('heading', { level: 1, name: 'Cylinder bore diameter' }).waitFor();
    await page.getByRole('button', { name: 'Start a draft' }).click();
    await page.getByRole('textbox', { name: /Minus tolerance/ }).fill('0.0003');
    await page.getByRole('textbox', { name: /Plus tolerance/ }).fill('0.0003');
    await page.getByRole('textbox', { name: 'Source note' }).fill('Tighter bores for the low-tension ring pack');
    await page.getByRole('button', { name: 'Save draft' }).click();
    const saved = page.getByText(/Draft version \d+ saved/);
    await saved.waitFor();
    const version = Number((await saved.textContent())!.match(/Draft version (\d+)/)![1]);
    await page.getByRole('button', { name: 'Rehearse', exact: true }).click();
    const flips = page.getByRole('region', { name: 'Parts that would flip' });
    await flips.getByRole('row').filter({ hasText: planted }).waitFor();
    await expect(flips.getByRole('row').filter({ hasText: planted }).textContent()).resolves.toContain(
      'Passed → would fail',
    );
    await page
      .getByText(/parts? would now fail/)
      .first()
      .waitFor();
    await page.screenshot({ path: path.join(shots, 'spc-rehearsal-1440.png'), fullPage: true });
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL(/sign-in/);

    await signIn(page, served.base, demo[1]!.email, demo[1]!.password);
    await page.goto(`${served.base}/spec/TARN-6/${boreId}`);
    await page.getByRole('button', { name: 'Approve…' }).first().click();
    const dialog = page.getByRole('dialog');
    await dialog.getByRole('heading', { name: 'What it would change' }).waitFor();
    await dialog.getByText(/parts? would now fail/).waitFor();
    await dialog.getByText('This rehearsal is kept with your approval.').waitFor();
    await page.screenshot({ path: path.join(shots, 'spc-approve-1440.png') });
    await dialog.getByRole('textbox', { name: 'Reason' }).fill('Tighter bores for the low-tension ring pack');
    await dialog.getByLabel('Password').fill(demo[1]!.password);
    await dialog.getByRole('button', { name: 'Sign and approve' }).click();
    await page.getByText(`Version ${version} in force`).first().waitFor();

    const family = (await EngineFamily.findOne({ where: { code: 'TARN-6' } }))!;
    const approved = (await ToleranceRule.findOne({
      where: { characteristicId: boreId, engineFamilyId: family.id, status: 'approved' },
      order: [['version', 'DESC']],
    }))!;
    expect(Number(approved.minusTol)).toBe(0.0003);
    const kept = await RuleRehearsal.findAll({ where: { toleranceRuleId: approved.id } });
    expect(kept.filter((r) => r.keptWithApprovalAt !== null)).toHaveLength(1);
    expect(kept[0]!.summary.parts.map((p) => p.serial)).toContain(planted);
    await context.close();
  });
});
