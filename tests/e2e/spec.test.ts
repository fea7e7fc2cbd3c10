import fs from 'node:fs';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import type { Browser } from 'playwright-core';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nominalSizeClasses, passingReadings } from '../../db/seeders/sample-readings.js';
import { DEMO_USERS } from '../../db/seeders/plant.js';
import { Characteristic, Stage, ToleranceRule } from '../../server/models/index.js';
import { cookieFor, makeUser, unique } from '../support/app.js';
import { launch, serveApp, signIn, type Served } from '../support/browser.js';
import { formFor, gaugesOf, passThrough, tornDownCore } from '../support/parts.js';

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

/** A V8 block at deck resurface, recorded with a 95 µin finish on both decks (through the API). */
async function deckResult() {
  const parts = await tornDownCore(served.t, cookies, 'CORRIE-8');
  await passThrough(served.t, cookies.operator, ['CLN-1', 'MPI-1', 'PT-1', 'LH-1', 'BH-1'], parts.block);
  const form = await formFor(served.t, cookies.operator, 'DK-1', parts.block);
  const res = await request(served.t.app)
    .post('/api/results')
    .set('Cookie', cookies.operator)
    .send({
      idempotencyKey: randomUUID(),
      serial: parts.block,
      station: 'DK-1',
      ...gaugesOf(form),
      readings: passingReadings(form, (c, _p, v) => (c === 'deck-finish' ? 95 : v)),
      sizeClasses: nominalSizeClasses(form),
    });
  return { serial: parts.block, result: res.body };
}

describe('the spec book in the browser', () => {
  it('quality tightens a limit and signs it; new results are judged by the new version, old ones keep theirs', async () => {
    const before = await deckResult();
    expect(before.result.verdict).toBe('pass');
    const stage = (await Stage.findOne({ where: { code: 'block-deck' } }))!;
    const c = (await Characteristic.findOne({ where: { stageId: stage.id, code: 'deck-finish' } }))!;
    const oldVersion = before.result.readings.find(
      (r: { characteristic: string }) => r.characteristic === 'deck-finish',
    ).ruleVersion as number;

    const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    const page = await context.newPage();
    const q = demo('quality');
    await signIn(page, served.base, q.email, q.password);
    await page.goto(`${served.base}/spec?family=CORRIE-8&stage=block-deck`);
    await page.getByRole('link', { name: 'Versions of Deck surface finish Ra' }).click();
    await page.getByRole('heading', { level: 1, name: 'Deck surface finish Ra' }).waitFor();
    await page.getByRole('button', { name: 'Start a draft' }).click();
    const upper = page.getByRole('textbox', { name: 'Upper limit' });
    await upper.waitFor();
    await upper.fill('90');
    await page.getByRole('textbox', { name: 'Source note' }).fill('MLS gasket trial: tighter finish');
    await page.getByRole('button', { name: 'Save draft' }).click();
    // the author does not approve their own draft: the second quality engineer does
    await page.getByText('You drafted this version').waitFor();
    await expect(page.getByRole('button', { name: 'Approve…' }).count()).resolves.toBe(0);
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL(/sign-in/);
    const q2 = DEMO_USERS.filter((u) => u.role === 'quality')[1]!;
    await signIn(page, served.base, q2.email, q2.password);
    await page.goto(`${served.base}/spec?family=CORRIE-8&stage=block-deck`);
    await page.getByRole('link', { name: 'Versions of Deck surface finish Ra' }).click();
    await page.getByRole('button', { name: 'Approve…' }).first().click();
    const dialog = page.getByRole('dialog');
    await dialog
      .getByText(`Approved CORRIE-8 Deck surface finish Ra, version ${oldVersion + 1}`)
      .first()
      .waitFor();
    await dialog.getByRole('textbox', { name: 'Reason' }).fill('Multi-layer steel gaskets from next week');
    await dialog.getByLabel('Password').fill(q2.password);
    await dialog.getByRole('button', { name: 'Sign and approve' }).click();
    await page
      .getByText(`Version ${oldVersion + 1} in force`)
      .first()
      .waitFor();
    await page.screenshot({ path: path.join(shots, 'spec-approved-1440.png'), fullPage: true });
    // the signature shows name, time and meaning
    await expect(page.getByText(q2.name).first().isVisible()).resolves.toBe(true);

    // a block recorded now is judged by the new version: 95 µin is over 90
    const after = await deckResult();
    expect(after.result.verdict).toBe('fail');
    const finish = after.result.failing.find((r: { characteristic: string }) => r.characteristic === 'deck-finish');
    expect(finish).toMatchObject({ ruleVersion: oldVersion + 1, upper: 90 });

    // the earlier block's result still shows the version it was judged by
    await page.goto(`${served.base}/items/${before.serial}`);
    const deck = page
      .getByRole('article')
      .filter({ has: page.getByRole('heading', { name: /Block deck resurface — Passed/ }) });
    await deck.getByText(/Readings \(\d+\)/).click();
    const row = deck.getByRole('row').filter({ hasText: 'Deck surface finish Ra' }).first();
    await expect(row.textContent()).resolves.toContain(`v${oldVersion}`);
    await page.goto(`${served.base}/items/${after.serial}`);
    const deck2 = page
      .getByRole('article')
      .filter({ has: page.getByRole('heading', { name: /Block deck resurface — Failed/ }) });
    await deck2.getByText(/Readings \(\d+\)/).click();
    const row2 = deck2.getByRole('row').filter({ hasText: 'Deck surface finish Ra' }).first();
    await expect(row2.textContent()).resolves.toContain(`v${oldVersion + 1}`);
    await page.screenshot({ path: path.join(shots, 'spec-new-version-result-1440.png'), fullPage: true });
    expect(c.id).toBeGreaterThan(0);
    await context.close();
  });

  it('quality drafts a rule with size classes on the screen; a repeated class is refused and the saved draft keeps each class', async () => {
    // a characteristic of the test's own, at a stage no route or station uses, so no part is asked for it
    const quality = await cookieFor(await makeUser('quality'), served.t.config);
    const tag = unique('').slice(0, 8);
    const stage = await request(served.t.app)
      .post('/api/process/stages')
      .set('Cookie', quality)
      .send({ code: `sc-bore-${tag}`, partKind: 'block', name: 'Size class bore check' });
    expect(stage.status).toBe(201);
    const made = await request(served.t.app)
      .post('/api/process/characteristics')
      .set('Cookie', quality)
      .send({
        stage: `sc-bore-${tag}`,
        code: `bore-${tag}`,
        name: `Finished bore ${tag}`,
        kind: 'variable',
        unit: 'mm',
        resolution: 0.001,
      });
    expect(made.status, JSON.stringify(made.body)).toBe(201);

    const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    const page = await context.newPage();
    const q = demo('quality');
    await signIn(page, served.base, q.email, q.password);
    await page.goto(`${served.base}/spec/TARN-6/${made.body.id}`);
    await page.getByRole('heading', { level: 1, name: `Finished bore ${tag}` }).waitFor();
    await page.getByRole('button', { name: 'Start a draft' }).click();
    await page.getByRole('textbox', { name: 'Nominal' }).fill('86');
    await page.getByRole('textbox', { name: 'Minus tolerance' }).fill('0');
    await page.getByRole('textbox', { name: 'Plus tolerance' }).fill('0.02');
    await page.getByRole('textbox', { name: 'Resolution' }).fill('0.001');
    await page.getByText('None: every part is judged on the limits above.').waitFor();
    // invented steps in the way of common practice: standard, then +0.25 mm and +0.50 mm over
    const steps = [
      ['STD', 'Standard', '86'],
      ['+0.25', 'First oversize', '86.25'],
      ['+0.25', 'Second oversize', '86.5'],
    ] as const;
    for (const [i, [code, name, nominal]] of steps.entries()) {
      await page.getByRole('button', { name: 'Add a size class' }).click();
      await page.getByRole('textbox', { name: `Size class ${i + 1} code` }).fill(code);
      await page.getByRole('textbox', { name: `Size class ${i + 1} name` }).fill(name);
      await page.getByRole('textbox', { name: `Size class ${i + 1} nominal` }).fill(nominal);
      await page.getByRole('textbox', { name: `Size class ${i + 1} plus tolerance` }).fill('0.02');
    }
    await page.getByRole('button', { name: 'Save draft' }).click();
    await page.getByText('+0.25 comes twice.').waitFor();
    expect(await ToleranceRule.count({ where: { characteristicId: made.body.id } })).toBe(0);
    await page.getByRole('textbox', { name: 'Size class 3 code' }).fill('+0.50');
    await page.getByRole('button', { name: 'Save draft' }).click();
    await page.getByText('You drafted this version').waitFor();
    await page.screenshot({ path: path.join(shots, 'spec-size-classes-1440.png'), fullPage: true });
    const draft = (await ToleranceRule.findOne({ where: { characteristicId: made.body.id, status: 'draft' } }))!;
    expect(draft.sizeClasses).toEqual([
      { code: 'STD', name: 'Standard', nominal: 86, minusTol: 0, plusTol: 0.02 },
      { code: '+0.25', name: 'First oversize', nominal: 86.25, minusTol: 0, plusTol: 0.02 },
      { code: '+0.50', name: 'Second oversize', nominal: 86.5, minusTol: 0, plusTol: 0.02 },
    ]);

    // a class removed on the screen is gone from the draft once saved; the others keep their numbers
    await page.getByRole('button', { name: 'Remove size class 2' }).click();
    await page.getByRole('button', { name: 'Save draft' }).click();
    await expect
      .poll(async () => (await draft.reload()).sizeClasses?.map((c) => c.code), { timeout: 10_000 })
      .toEqual(['STD', '+0.50']);
    await context.close();
  });
});
