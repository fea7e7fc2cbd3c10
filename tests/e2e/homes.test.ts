import fs from 'node:fs';
import path from 'node:path';
import type { Browser } from 'playwright-core';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_USERS } from '../../db/seeders/plant.js';
import type { WipJson } from '../../shared/schemas/line.js';
import { signInCookie } from '../support/app.js';
import { launch, serveApp, signIn, type Served } from '../support/browser.js';
import { finishedParts, lotsFor, pass } from '../support/parts.js';

// Each role's home shows its own work from live data; the supervisor reaches the unit waiting for
// its run test in one tap; a fragment of a serial typed in the header's search finds it.
let served: Served;
let browser: Browser;
let unit: string;
let cookies: { receiving: string; operator: string; supervisor: string };
const shots = path.resolve('test-results/e2e');
const demo = (role: string) => DEMO_USERS.find((u) => u.role === role)!;
const SIZES = [
  { width: 1024, height: 768 },
  { width: 1440, height: 900 },
];

beforeAll(async () => {
  served = await serveApp();
  browser = await launch();
  fs.mkdirSync(shots, { recursive: true });
  const t = served.t;
  cookies = {
    receiving: await signInCookie(t, demo('receiving').email, demo('receiving').password),
    operator: await signInCookie(t, demo('operator').email, demo('operator').password),
    supervisor: await signInCookie(t, demo('supervisor').email, demo('supervisor').password),
  };
  // a long block of our own, assembled and waiting for its run test
  const parts = await finishedParts(t, cookies, 'TARN-6');
  const built = await request(t.app)
    .post('/api/units')
    .set('Cookie', cookies.operator)
    .send({
      family: 'TARN-6',
      block: parts.block,
      crankshaft: parts.crankshaft,
      heads: parts.heads,
      lots: await lotsFor(0.0197, `H${Date.now().toString(36).toUpperCase()}`),
    });
  if (built.status !== 201) throw new Error(`build failed: ${JSON.stringify(built.body)}`);
  unit = built.body.serial;
  await pass(t, cookies.operator, 'AS-1', unit);
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await served?.close();
});

const HOME_CARDS: Record<string, RegExp[]> = {
  receiving: [/^Cores awaiting teardown \(\d+\)$/],
  operator: [/^Your station’s queue \(\d+\)$/],
  quality: [/^Open NCRs by age \(\d+\)$/, /^Alerts \(\d+\)$/, /^Awaiting your signature \(\d+\)$/],
  supervisor: [/^Work in process$/, /^Alerts \(\d+\)$/],
  shipping: [/^Ready to release \(\d+\)$/, /^Blocked \(\d+\)$/],
  warranty: [/^Open field actions \(\d+\)$/],
};

describe('role homes', () => {
  for (const size of SIZES) {
    for (const role of Object.keys(HOME_CARDS)) {
      it(`when ${role} signs in at ${size.width}×${size.height}, then the home shows the role’s own counts and lists`, async () => {
        const page = await browser.newPage({ viewport: size });
        try {
          await signIn(page, served.base, demo(role).email, demo(role).password);
          for (const title of HOME_CARDS[role]!) {
            await expect(page.getByRole('heading', { level: 2, name: title }).waitFor()).resolves.toBeUndefined();
          }
          // the counts are the live ones: the same numbers the API gives now
          if (role === 'receiving') {
            const q = await request(served.t.app).get('/api/line/teardown-queue').set('Cookie', cookies.receiving);
            await page.getByRole('heading', { name: `Cores awaiting teardown (${q.body.total})` }).waitFor();
          }
          if (role === 'supervisor') {
            const wip = (await request(served.t.app).get('/api/line/wip').set('Cookie', cookies.supervisor))
              .body as WipJson;
            const waiting = wip.stages.reduce((s, r) => s + r.waiting, 0);
            const card = page.getByRole('region', { name: 'Work in process' });
            await expect(card.getByText(`${waiting}`, { exact: true }).first().isVisible()).resolves.toBe(true);
          }
          // nothing spills past the right edge
          const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
          expect(overflow).toBeLessThanOrEqual(0);
          await page.screenshot({ path: path.join(shots, `home-${role}-${size.width}.png`), fullPage: true });
        } finally {
          await page.close();
        }
      });
    }
  }
});

describe('one tap and one box', () => {
  it('when the supervisor opens home, then the unit waiting for its run test is one tap away', async () => {
    const page = await browser.newPage({ viewport: SIZES[0] });
    try {
      await signIn(page, served.base, demo('supervisor').email, demo('supervisor').password);
      const atRunTest = (
        (
          await request(served.t.app)
            .get('/api/line/wip')
            .query({ stage: 'run-test' })
            .set('Cookie', cookies.supervisor)
        ).body as WipJson
      ).items;
      expect(atRunTest.map((i) => i.serial)).toContain(unit);
      // the oldest waiting unit is the first the home lists under the run test
      const first = atRunTest[0]!.serial;
      const card = page.getByRole('region', { name: 'Work in process' });
      await card.getByRole('heading', { level: 3, name: /^Run test/ }).waitFor();
      await card.getByRole('link', { name: new RegExp(first) }).click();
      await page.waitForURL(`**/items/${first}`);
      await page.getByRole('heading', { level: 1, name: new RegExp(first) }).waitFor();
      await page.screenshot({ path: path.join(shots, `home-supervisor-tap.png`) });
    } finally {
      await page.close();
    }
  });

  for (const size of SIZES) {
    it(`when a fragment of the unit’s serial is typed in the search box at ${size.width}×${size.height}, then the unit is found under serials`, async () => {
      const page = await browser.newPage({ viewport: size });
      try {
        await signIn(page, served.base, demo('supervisor').email, demo('supervisor').password);
        const fragment = unit.slice(2, 8).toLowerCase();
        const box = page.getByRole('searchbox', { name: /Search serials/ });
        await box.fill(fragment);
        await box.press('Enter');
        await page.waitForURL(`**/search?q=${fragment}`);
        const serials = page.getByRole('region', { name: /^Serials/ });
        await serials.getByRole('link', { name: new RegExp(unit) }).waitFor();
        await page.screenshot({ path: path.join(shots, `search-${size.width}.png`), fullPage: true });
        await serials.getByRole('link', { name: new RegExp(unit) }).click();
        await page.waitForURL(`**/items/${unit}`);
      } finally {
        await page.close();
      }
    });
  }

  it('when the supervisor opens the board and the yields, then each chart has its numbers one click away', async () => {
    const page = await browser.newPage({ viewport: SIZES[1] });
    try {
      await signIn(page, served.base, demo('supervisor').email, demo('supervisor').password);
      await page.goto(`${served.base}/wip`);
      await page.getByRole('heading', { level: 1, name: 'Work in process' }).waitFor();
      await page.getByRole('cell', { name: 'Run test' }).first().waitFor();
      await page.screenshot({ path: path.join(shots, 'wip-1440.png'), fullPage: true });
      await page.goto(`${served.base}/yields`);
      await page.getByRole('heading', { level: 1, name: 'Yields and losses' }).waitFor();
      await page.waitForURL(/from=\d{4}-\d{2}-\d{2}&to=/);
      const fpyCard = page.getByRole('region', { name: 'First-pass yield per stage' });
      await fpyCard.getByRole('img').waitFor();
      await fpyCard.getByText('Show the numbers').click();
      await fpyCard.getByRole('table').getByRole('cell', { name: 'all' }).first().waitFor();
      await page.screenshot({ path: path.join(shots, 'yields-1440.png'), fullPage: true });
    } finally {
      await page.close();
    }
  });
});
