import fs from 'node:fs';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import type { Browser, Page } from 'playwright-core';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_USERS } from '../../db/seeders/plant.js';
import { Shipment } from '../../server/models/index.js';
import { signInCookie, type TestApp } from '../support/app.js';
import { launch, serveApp, signIn, type Served } from '../support/browser.js';
import { finishedParts, passThrough, releasableUnit } from '../support/parts.js';

/**
 * A head found cracked after its unit was built: the gate stops the unit, the build bench swaps the
 * head, the unit is tested again and released with the shipper's signature, and the trail keeps
 * both heads with their dates.
 */

let served: Served;
let t: TestApp;
let browser: Browser;
let cookies: { receiving: string; operator: string };
let quality: string;
const shots = path.resolve('test-results/e2e');
const demo = (role: string) => DEMO_USERS.find((u) => u.role === role)!;

beforeAll(async () => {
  served = await serveApp();
  t = served.t;
  browser = await launch();
  fs.mkdirSync(shots, { recursive: true });
  cookies = {
    receiving: await signInCookie(t, demo('receiving').email, demo('receiving').password),
    operator: await signInCookie(t, demo('operator').email, demo('operator').password),
  };
  quality = await signInCookie(t, demo('quality').email, demo('quality').password);
});
afterAll(async () => {
  await browser?.close();
  await served?.close();
});

async function page(role: string, width = 1440, height = 900): Promise<Page> {
  const context = await browser.newContext({ viewport: { width, height } });
  const p = await context.newPage();
  await signIn(p, served.base, demo(role).email, demo(role).password);
  return p;
}

describe('a head scrapped after its unit was built', () => {
  it('blocks the unit; the build bench replaces it; the unit is released with a signature; the trail shows both heads', async () => {
    const lots = `E${randomUUID().slice(0, 5).toUpperCase()}`;
    const { unit, parts } = await releasableUnit(t, cookies, 'TARN-6', lots);
    const cracked = parts.heads[0]!;
    const raised = await request(t.app).post('/api/ncrs').set('Cookie', cookies.operator).send({
      serial: cracked,
      description: 'Crack from the exhaust seat into the port, seen at final inspection',
      severity: 'critical',
      defectCode: 'CRK',
    });
    await request(t.app).post(`/api/ncrs/${raised.body.number}/review`).set('Cookie', quality).send({});
    const scrapped = await request(t.app)
      .post(`/api/ncrs/${raised.body.number}/disposition`)
      .set('Cookie', quality)
      .send({ disposition: 'scrap', reason: 'Cracked through the seat', password: demo('quality').password });
    expect(scrapped.body.item.status).toBe('scrapped');

    // shipping sees why it cannot go
    const s = await page('shipping');
    await s.goto(`${served.base}/release?serial=${unit}`);
    await s.getByText(`${cracked} (cylinder head) has been scrapped`).first().waitFor();
    await s.screenshot({ path: path.join(shots, 'gate-scrapped-head-1440.png'), fullPage: true });

    // the build bench, on a tablet: take the cracked head out, fit a finished one
    const spare = await finishedParts(t, cookies, 'TARN-6');
    const op = await page('operator', 1024, 768);
    await op.goto(`${served.base}/build`);
    await op.getByRole('button', { name: 'Replace a part in a built unit' }).click();
    const box = op.getByRole('textbox', { name: 'Serial' });
    await box.fill(unit);
    await box.press('Enter');
    await op.getByRole('radio', { name: new RegExp(`${cracked}.*scrapped`) }).waitFor();
    await expect(op.getByRole('radio', { name: new RegExp(cracked) }).isChecked()).resolves.toBe(true);
    await op.getByLabel('Part to fit').fill(spare.heads[0]!);
    await op.getByLabel('Why it is replaced').fill('Cracked head scrapped after assembly');
    await op.screenshot({ path: path.join(shots, 'replace-part-1024.png'), fullPage: true });
    await op.getByRole('button', { name: 'Replace the part' }).click();
    await op.getByText(`${spare.heads[0]} fitted in ${unit}`).waitFor();
    await op.getByText(/record assembly, the run test and final inspection again/).waitFor();

    // assembled and run again with the new head in
    await passThrough(t, cookies.operator, ['AS-1', 'RT-1', 'FI-1'], unit);

    // released with the shipper's signature
    await s.reload();
    await s.getByText('Ready to ship').first().waitFor();
    await s.getByLabel('Customer').selectOption({ index: 1 });
    await s.getByLabel('Order reference').fill(`SO-${lots}`);
    await s.getByLabel('Password').fill('not my password');
    await s.getByRole('button', { name: 'Sign, release and ship' }).click();
    await s.getByText('That is not your password.').waitFor();
    expect(await Shipment.count({ where: { reference: `SO-${lots}` } })).toBe(0);
    await s.getByLabel('Password').fill(demo('shipping').password);
    await s.getByRole('button', { name: 'Sign, release and ship' }).click();
    await s.getByText(`SO-${lots}`).first().waitFor();
    expect(await Shipment.count({ where: { reference: `SO-${lots}` } })).toBe(1);

    // the trail keeps both heads, each with when it went in and, for the cracked one, when it came out
    const w = await page('warranty');
    await w.goto(`${served.base}/trail?serial=${unit}`);
    const tree = w.getByRole('list', { name: 'Genealogy' });
    await tree.getByText('Cracked head scrapped after assembly').waitFor();
    await expect(tree.getByRole('link', { name: cracked }).isVisible()).resolves.toBe(true);
    await expect(tree.getByRole('link', { name: spare.heads[0]! }).isVisible()).resolves.toBe(true);
    await expect(tree.getByText('taken out', { exact: true }).isVisible()).resolves.toBe(true);
    expect(await tree.getByText(/^Fitted /).count()).toBeGreaterThanOrEqual(4);
    await w.screenshot({ path: path.join(shots, 'trail-replaced-head-1440.png'), fullPage: true });
  });
});
