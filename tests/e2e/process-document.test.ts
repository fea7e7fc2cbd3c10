import fs from 'node:fs';
import path from 'node:path';
import AxeBuilder from '@axe-core/playwright';
import type { Browser, Locator, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Characteristic, EngineFamily, ProcessImport, Route, Stage, type User } from '../../server/models/index.js';
import { TEST_PASSWORD, makeUser, unique } from '../support/app.js';
import { launch, serveApp, signIn, type Served } from '../support/browser.js';

/**
 * The process document screen and characteristic changes, in the browser: quality downloads the
 * plant's document, imports one of the test's own (a bad one first, refused with every problem by
 * its path and nothing kept), a second quality engineer approves it with a signature, and the new
 * stage is on the Process page; then a change to the imported characteristic is proposed by one and
 * approved by the other after comparing the two versions. Codes are made unique per run.
 */
let served: Served;
let browser: Browser;
let author: User;
let approver: User;
const shots = path.resolve('test-results/e2e');
const tag = unique('')
  .replace(/[^a-z0-9]/gi, '')
  .slice(-6)
  .toLowerCase();
const FAMILY = `PD-${tag.toUpperCase()}`;
const STAGE = `pd-wash-${tag}`;
const CHAR = `pd-clean-${tag}`;

/** The test's own small plant: a family, a block stage, its characteristic and route, and one thing kept. */
const goodDocument = () => ({
  format: 'coretrail-process',
  version: 1,
  // the plant has this one already: kept as it is
  partKinds: [{ code: 'block', name: 'Block', serialized: true }],
  families: [
    {
      code: FAMILY,
      name: 'Document test inline four',
      layout: 'inline',
      cylinders: 4,
      boreMm: 86,
      strokeMm: 86,
      headsPerEngine: 1,
      warrantyMonths: 12,
      warrantyKm: null,
    },
  ],
  stages: [
    {
      code: STAGE,
      partKind: 'block',
      name: `Block spray wash ${tag}`,
      caution: 'Hot water under pressure.',
      hazardous: true,
    },
  ],
  characteristics: [{ stage: STAGE, code: CHAR, name: 'Galleries clean', kind: 'attribute' }],
  routes: [{ family: FAMILY, partKind: 'block', steps: [{ stage: STAGE }] }],
  castingNumbers: [],
});

/** Interactive controls in `main` smaller than a finger's 44 px on either side (a tablet's floor). */
const smallTargets = (page: Page) =>
  page.evaluate(() =>
    [...document.querySelectorAll('main input, main button, main select, main textarea, main a')]
      .map((el) => ({ el, r: el.getBoundingClientRect() }))
      .filter(({ r }) => r.width > 1 && r.height > 1 && (r.width < 44 || r.height < 44))
      .map(({ el, r }) => `${el.tagName} "${(el.textContent ?? '').trim().slice(0, 30)}" ${r.width}×${r.height}`),
  );

const axeProblems = async (page: Page) =>
  (await new AxeBuilder({ page }).options({ rules: { 'target-size': { enabled: true } } }).analyze()).violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(' ')).join(', ')}`);

async function session(user: User, width = 1440, height = 900): Promise<Page> {
  const context = await browser.newContext({
    viewport: { width, height },
    acceptDownloads: true,
    ...(width < 1280 ? { hasTouch: true } : {}),
  });
  const page = await context.newPage();
  await signIn(page, served.base, user.email, TEST_PASSWORD);
  return page;
}

/** At 1024×768 on a touch screen: every target big enough, no serious axe problem, a screenshot. */
async function onTablet(
  user: User,
  url: string,
  shot: string,
  ready: (p: Page) => Promise<unknown>,
  /** The part of a long page to picture, scrolled to the top of the screen; the whole page otherwise. */
  part?: (p: Page) => Locator,
) {
  const p = await session(user, 1024, 768);
  await p.goto(`${served.base}${url}`);
  await ready(p);
  expect(await smallTargets(p)).toEqual([]);
  expect(await axeProblems(p)).toEqual([]);
  expect(await p.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(1024);
  if (part) {
    // a long page on a touch screen: the part in view, as the tablet shows it
    await part(p).evaluate((el) => el.scrollIntoView({ block: 'start' }));
    await p.screenshot({ path: path.join(shots, shot) });
  } else await p.screenshot({ path: path.join(shots, shot), fullPage: true });
  await p.context().close();
}

beforeAll(async () => {
  served = await serveApp();
  browser = await launch();
  fs.mkdirSync(shots, { recursive: true });
  // one draft import waits at a time: a draft left by an earlier run that stopped half way would hold it
  await ProcessImport.update({ status: 'discarded' }, { where: { status: 'draft' } });
  author = await makeUser('quality', { name: 'Ada Okafor' });
  approver = await makeUser('quality', { name: 'Tomas Lindqvist' });
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await served?.close();
});

describe('the process document screen', () => {
  it('when quality imports a document of its own, then a bad one is refused by path with nothing kept, and a second engineer approves the good one with a signature', async () => {
    const page = await session(author);
    // reached from the Process page and from the navigation
    await page.goto(`${served.base}/admin/process`);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Process document' }).waitFor();
    await page.getByRole('main').getByRole('link', { name: 'Process document' }).click();
    await page.getByRole('heading', { level: 1, name: 'Process document' }).waitFor();

    // the plant's document, downloaded as a file
    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('button', { name: 'Download JSON' }).click(),
    ]);
    expect(download.suggestedFilename()).toMatch(/^coretrail-process-\d{4}-\d{2}-\d{2}\.json$/);
    const exported = JSON.parse(fs.readFileSync((await download.path())!, 'utf8')) as {
      format: string;
      version: number;
      stages: { code: string }[];
    };
    expect([exported.format, exported.version]).toEqual(['coretrail-process', 1]);
    expect(exported.stages.length).toBeGreaterThan(0);
    await page.getByText(/Saved as coretrail-process-/).waitFor();

    const file = page.getByLabel('Process document (JSON)');
    // a file that is not JSON at all
    await file.setInputFiles({ name: 'notes.json', mimeType: 'application/json', buffer: Buffer.from('stages: none') });
    await page.getByText('notes.json is not a JSON file Coretrail can read.').waitFor();

    // a document whose characteristic names a stage nobody has, and whose route takes a crankshaft
    // stage for a block: each problem by its path, in words, and nothing kept
    const bad = goodDocument();
    bad.characteristics[0]!.stage = `pd-none-${tag}`;
    (bad.routes[0]!.steps as { stage: string }[]).push({ stage: 'crank-grind' });
    await file.setInputFiles({
      name: 'bad.json',
      mimeType: 'application/json',
      buffer: Buffer.from(JSON.stringify(bad)),
    });
    const problems = page.getByRole('list', { name: 'Problems in the document' });
    await problems.waitFor();
    await page.getByText('The document has 2 problems; nothing was changed.').waitFor();
    const items = await problems.getByRole('listitem').allTextContents();
    expect(items).toHaveLength(2);
    expect(items[0]).toContain(`Characteristic 1 (pd-none-${tag}/${CHAR}), stage: No stage pd-none-${tag}.`);
    expect(items[0]).toContain('characteristics.0.stage');
    expect(items[1]).toContain(`Route 1 (${FAMILY} block), step 2 (crank-grind), stage`);
    expect(items[1]).toContain('routes.0.steps.1.stage');
    await page.getByText('Nothing was kept').waitFor();
    await page.screenshot({ path: path.join(shots, 'process-document-problems-1440.png'), fullPage: true });
    expect([
      await Stage.count({ where: { code: STAGE } }),
      await EngineFamily.count({ where: { code: FAMILY } }),
    ]).toEqual([0, 0]);
    expect(await ProcessImport.count({ where: { createdById: author.id } })).toBe(0);

    // the good one: checked, then kept as a draft with its plan
    await file.setInputFiles({
      name: 'wash-line.json',
      mimeType: 'application/json',
      buffer: Buffer.from(JSON.stringify(goodDocument())),
    });
    await page.getByText('wash-line.json fits the plant.').waitFor();
    await page
      .getByRole('textbox', { name: 'Why (kept with the import, optional)' })
      .fill('New wash line for the test family');
    await page.getByRole('button', { name: 'Import as a draft' }).click();
    const draft = page.getByRole('region', { name: /^Import \d+: waiting for approval$/ });
    await draft.waitFor();
    const plan = draft.getByRole('region', { name: 'What the import changes' });
    await plan.getByText(`1 stage: ${STAGE}`).waitFor();
    await plan.getByText(`1 characteristic: ${STAGE}/${CHAR}`).waitFor();
    await plan.getByText(`1 engine family: ${FAMILY}`).waitFor();
    await plan.getByText(`${FAMILY} block`).waitFor();
    await plan.getByText(/^1 thing the plant already has/).waitFor();
    // its importer is told someone else approves it, and is not offered the signature
    await draft.getByText('Someone else approves this draft: you imported it.').waitFor();
    expect(await draft.getByRole('button', { name: 'Approve and sign…' }).count()).toBe(0);
    await page.screenshot({ path: path.join(shots, 'process-document-draft-1440.png'), fullPage: true });
    expect(await Stage.count({ where: { code: STAGE } })).toBe(0);
    const imp = (await ProcessImport.findOne({ where: { createdById: author.id, status: 'draft' } }))!;

    await onTablet(author, '/admin/process/document', 'process-document-draft-1024.png', (p) =>
      p.getByRole('region', { name: /waiting for approval/ }).waitFor(),
    );

    // a second quality engineer signs it: name, meaning, reason and time in the dialog
    const other = await session(approver);
    await other.goto(`${served.base}/admin/process/document`);
    const waiting = other.getByRole('region', { name: `Import ${imp.id}: waiting for approval` });
    await waiting.getByRole('textbox', { name: 'Reason' }).fill(`Wash line agreed at the process review ${tag}`);
    await waiting.getByRole('button', { name: 'Approve and sign…' }).click();
    const sign = other.getByRole('dialog', { name: 'Approve and sign' });
    await sign.getByText('Tomas Lindqvist').waitFor();
    await sign.getByText(`process import ${imp.id}`).waitFor();
    await sign.getByText(`Wash line agreed at the process review ${tag}`).waitFor();
    await sign.getByText('As soon as you sign').waitFor();
    // a wrong password is refused in the server's words, and nothing is applied
    await sign.getByLabel('Password').fill('not-the-password');
    await sign.getByRole('button', { name: 'Approve and sign' }).click();
    await sign.getByText('The password does not match: the import was not approved.').waitFor();
    expect(await Stage.count({ where: { code: STAGE } })).toBe(0);
    await other.screenshot({ path: path.join(shots, 'process-document-sign-1440.png') });
    await sign.getByLabel('Password').fill(TEST_PASSWORD);
    await sign.getByRole('button', { name: 'Approve and sign' }).click();
    await other.getByText(`Import ${imp.id} approved.`).waitFor();
    const row = other
      .getByRole('table', { name: 'Imports' })
      .getByRole('row')
      .filter({ hasText: `Wash line agreed at the process review ${tag}` });
    await row.getByText('Approved').waitFor();
    await row.getByText('Tomas Lindqvist').waitFor();
    await row.getByText('Ada Okafor').waitFor();
    await other.screenshot({ path: path.join(shots, 'process-document-approved-1440.png'), fullPage: true });

    // the new stage is on the Process page, its route approved in force
    await other.goto(`${served.base}/admin/process`);
    await other.getByRole('cell', { name: new RegExp(`Block spray wash ${tag}`) }).waitFor();
    const family = (await EngineFamily.findOne({ where: { code: FAMILY } }))!;
    const route = (await Route.findOne({ where: { engineFamilyId: family.id, partKind: 'block' } }))!;
    expect([route.status, route.active, route.approvedById]).toEqual(['approved', true, approver.id]);
    await other.context().close();
    await page.context().close();
  }, 240_000);

  it('when one engineer proposes a change to a characteristic, then a second compares the versions and approves it with a signature', async () => {
    const c = (await Characteristic.findOne({ where: { code: CHAR } }))!;
    const page = await session(author);
    await page.goto(`${served.base}/admin/process`);
    await page.getByRole('button', { name: `Changes to ${STAGE} ${CHAR}` }).click();
    const history = page.getByRole('region', { name: 'Changes to Galleries clean' });
    await history.getByText('No change yet.', { exact: false }).waitFor();
    await history.getByRole('button', { name: 'Propose a change' }).click();
    const d = page.getByRole('dialog', { name: 'Propose a change to Galleries clean' });
    await d.getByRole('textbox', { name: 'Name', exact: true }).fill('Oil galleries clean and clear');
    await d.getByLabel('Critical characteristic').check();
    await d.getByRole('textbox', { name: 'What changes and why' }).fill('Galleries blocked twice last month');
    await page.screenshot({ path: path.join(shots, 'characteristic-change-propose-1440.png') });
    await d.getByRole('button', { name: 'Save draft' }).click();
    await d.waitFor({ state: 'hidden' });
    await history.getByText('Version 2 is a draft').waitFor();
    await history.getByText('Someone else approves this draft: you drafted it.').waitFor();
    expect(await history.getByRole('button', { name: 'Approve and sign…' }).count()).toBe(0);
    await page.getByRole('region', { name: 'Characteristic changes waiting for approval' }).waitFor();
    // the Process page is long: the changes part of it is pictured
    await history.screenshot({ path: path.join(shots, 'characteristic-change-draft-1440.png') });
    await page.context().close();

    const other = await session(approver);
    await other.goto(`${served.base}/admin/process`);
    await other.getByRole('button', { name: `Review the change to ${STAGE} ${CHAR}` }).click();
    // named after the characteristic, whose name the change itself alters
    const review = other.getByRole('region', { name: /^Changes to / });
    // side by side: the changed fields said in words
    const compare = review.getByRole('table', { name: /Version 1 beside version 2/ });
    await compare.waitFor();
    await review.getByText('2 fields change: Name, Critical.').waitFor();
    const changed = async (field: string) =>
      (await compare
        .getByRole('row')
        .filter({ has: other.getByRole('rowheader', { name: field, exact: true }) })
        .textContent()) ?? '';
    expect(await changed('Name')).toContain('Changed');
    expect(await changed('Critical')).toContain('Changed');
    expect(await changed('Gauge kinds')).toContain('Same');
    await other
      .getByRole('region', { name: 'Characteristic changes waiting for approval' })
      .screenshot({ path: path.join(shots, 'characteristic-change-waiting-1440.png') });
    await review.screenshot({ path: path.join(shots, 'characteristic-change-compare-1440.png') });

    await onTablet(
      approver,
      '/admin/process',
      'characteristic-change-compare-1024.png',
      async (p) => {
        await p.getByRole('button', { name: `Review the change to ${STAGE} ${CHAR}` }).click();
        await p.getByRole('table', { name: /Version 1 beside version 2/ }).waitFor();
      },
      (p) => p.getByRole('region', { name: 'Compare two versions' }),
    );

    await review.getByRole('textbox', { name: 'Reason' }).fill('Blocked galleries seen at run test');
    await review.getByRole('button', { name: 'Approve and sign…' }).click();
    const sign = other.getByRole('dialog', { name: 'Approve and sign' });
    await sign.getByText('approve the change to Galleries clean, version 2', { exact: false }).waitFor();
    await sign.getByLabel('Password').fill(TEST_PASSWORD);
    await sign.getByRole('button', { name: 'Approve and sign' }).click();
    await review.getByText('Version 2 approved by Tomas Lindqvist; in force now.').waitFor();
    // the two versions stay side by side: the one in force now beside the one it superseded
    await review.getByText('2 fields change: Name, Critical.').waitFor();
    await review.screenshot({ path: path.join(shots, 'characteristic-change-approved-1440.png') });
    await c.reload();
    expect([c.name, c.critical]).toEqual(['Oil galleries clean and clear', true]);
    await other.context().close();
  }, 240_000);
});
