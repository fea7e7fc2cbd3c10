import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseSerial } from '../../shared/domain/serial.js';
import { Customer, EngineFamily, Item } from '../../server/models/index.js';
import { cookieFor, makeUser, TEST_PASSWORD, unique } from '../support/app.js';
import { launch, serveApp, signIn, type Served } from '../support/browser.js';
import { axeProblems, headerProblems, smallTargets } from '../support/floor-checks.js';
import { tornDownCore } from '../support/parts.js';

let served: Served;
let browser: Browser;
const shots = path.resolve('test-results/e2e');

beforeAll(async () => {
  served = await serveApp();
  browser = await launch();
  fs.mkdirSync(shots, { recursive: true });
});
afterAll(async () => {
  await browser?.close();
  await served?.close();
});

/** A person of this role who reads Spanish, signed in on a 1024×768 touch tablet. */
async function spanishTablet(role: 'receiving' | 'operator') {
  const person = await makeUser(role);
  await person.update({ language: 'es' });
  const context = await browser.newContext({ viewport: { width: 1024, height: 768 }, hasTouch: true });
  const page = await context.newPage();
  await signIn(page, served.base, person.email, TEST_PASSWORD);
  await page.locator('html[lang="es"]').waitFor();
  return { person, context, page };
}

async function floorChecks(page: Page) {
  expect(await axeProblems(page)).toEqual([]);
  expect(await smallTargets(page)).toEqual([]);
}

describe('the floor screens in Spanish on a 1024×768 tablet', () => {
  it('when a receiving person reads Spanish, then the navigation fits, and receiving a core and tearing it down are in Spanish with the cautions shown, every target at least 44 px and no serious accessibility problem', async () => {
    const { context, page } = await spanishTablet('receiving');

    // the header and navigation at 1024 px: nothing outside the window, overlapping or cut off
    const nav = page.getByRole('navigation', { name: 'Main' });
    await nav.getByRole('link', { name: 'Desarme' }).waitFor();
    await expect(nav.getByRole('link', { name: 'Inicio' }).isVisible()).resolves.toBe(true);
    await expect(page.getByRole('button', { name: 'Cerrar sesión' }).isVisible()).resolves.toBe(true);
    expect(await headerProblems(page)).toEqual([]);
    await page.screenshot({ path: path.join(shots, 'floor-spanish-receiving-nav-1024.png') });
    // the home: the role's own words, the cores waiting for teardown, the tiles
    await page.goto(`${served.base}/`);
    await page.getByRole('heading', { level: 1, name: 'Inicio: Recepción' }).waitFor();
    await expect(page.getByRole('heading', { name: 'Buscar un casco o una pieza' }).isVisible()).resolves.toBe(true);
    // the count arrives with the queue: the title reads "(…)" until then
    await page.getByRole('heading', { name: /^Cascos que esperan desarme \(\d+\)$/ }).waitFor();
    await expect(page.getByRole('link', { name: /^Recibir un casco/ }).isVisible()).resolves.toBe(true);
    await page.screenshot({ path: path.join(shots, 'floor-spanish-receiving-home-1024.png'), fullPage: true });
    await floorChecks(page);

    // 1. receive a V8 core
    const v8 = (await EngineFamily.findOne({ where: { code: 'CORRIE-8' } }))!;
    const customer = (await Customer.findOne({ order: [['id', 'ASC']] }))!;
    await page.goto(`${served.base}/intake/new`);
    await page.getByRole('heading', { level: 1, name: 'Recibir un casco' }).waitFor();
    await expect(page.getByRole('heading', { name: 'Antes de guardar' }).isVisible()).resolves.toBe(true);
    await page.getByLabel('Familia de motor').selectOption(String(v8.id));
    await page.getByLabel('Número de fundición').fill('CV8 4471-B');
    const idNumber = unique('ES').toUpperCase();
    await page.getByLabel('Número de identificación').fill(idNumber);
    await page.getByLabel('Cliente', { exact: true }).selectOption(String(customer.id));
    await page.getByLabel('Referencia de devolución').fill(unique('RMA-'));
    await page.getByLabel('Crédito por casco').selectOption('full');
    // the options' words are Spanish too
    await expect(page.getByLabel('Clase').locator('option[value="sound"]').textContent()).resolves.toMatch(/^Sano/);
    await page.getByLabel('Clase').selectOption('sound');
    await page.getByRole('radio', { name: 'Aceptar' }).check();
    await expect(page.getByText('Todo lo necesario está completo.').isVisible()).resolves.toBe(true);
    await page.screenshot({ path: path.join(shots, 'floor-spanish-receive-1024.png'), fullPage: true });
    await floorChecks(page);
    await page.getByRole('button', { name: 'Recibir casco' }).click();
    await page.waitForURL(/\/cores\/CR-/);
    const coreSerial = decodeURIComponent(page.url().split('/cores/')[1]!.split(/[?#]/)[0]!);
    expect(parseSerial(coreSerial)).toMatchObject({ ok: true, kind: 'core' });
    // the core's page it lands on speaks Spanish too: what was received, and what to do next
    await page.getByText('Casco recibido').waitFor();
    await expect(page.getByRole('heading', { name: 'Piezas sacadas de él' }).isVisible()).resolves.toBe(true);
    await expect(page.getByText('Devolución de cliente').isVisible()).resolves.toBe(true);
    await expect(page.getByRole('link', { name: 'Desarmar' }).isVisible()).resolves.toBe(true);
    await page.screenshot({ path: path.join(shots, 'floor-spanish-core-1024.png'), fullPage: true });
    await floorChecks(page);

    // 2. tear it down: the heavy-parts caution is there in Spanish, the part tiles in Spanish
    await page.goto(`${served.base}/teardown`);
    await page.getByRole('heading', { level: 1, name: 'Desarme' }).waitFor();
    const box = page.getByRole('textbox', { name: 'Número de serie' });
    await box.fill(coreSerial);
    await box.press('Enter');
    const caution = page.getByRole('complementary', { name: /^Seguridad: / });
    await caution.waitFor();
    await expect(caution.textContent()).resolves.toMatch(/polipasto/);
    for (const name of [
      'Conservar Bloque',
      'Conservar Cigüeñal',
      'Conservar Culata (izquierda)',
      'Conservar Culata (derecha)',
    ]) {
      await page.getByRole('radio', { name }).check();
    }
    await page.screenshot({ path: path.join(shots, 'floor-spanish-teardown-1024.png'), fullPage: true });
    await floorChecks(page);
    await page.getByRole('button', { name: 'Registrar desarme' }).click();
    await page.getByRole('heading', { name: 'Desarme registrado' }).waitFor();
    await expect(page.getByText('4 piezas con número de serie').isVisible()).resolves.toBe(true);
    await page.screenshot({ path: path.join(shots, 'floor-spanish-teardown-done-1024.png'), fullPage: true });
    expect((await Item.findOne({ where: { serial: coreSerial } }))!.status).toBe('torn_down');

    // 3. the same numbers again: the server's refusal (409 possible_duplicate) in Spanish, by its reason
    await page.goto(`${served.base}/intake/new`);
    await page.getByLabel('Familia de motor').selectOption(String(v8.id));
    await page.getByLabel('Número de fundición').fill('CV8 4471-B');
    await page.getByLabel('Número de identificación').fill(idNumber);
    await page.getByLabel('Cliente', { exact: true }).selectOption(String(customer.id));
    await page.getByLabel('Referencia de devolución').fill(unique('RMA-'));
    await page.getByLabel('Crédito por casco').selectOption('full');
    await page.getByLabel('Clase').selectOption('sound');
    await page.getByRole('radio', { name: 'Aceptar' }).check();
    await page.getByRole('button', { name: 'Recibir casco' }).click();
    await page.getByText('Compruebe que no es uno de estos cascos').waitFor();
    await expect(
      page
        .getByRole('alert')
        .filter({ hasText: 'Un casco reciente tiene el mismo número. Compruebe que no es el mismo casco' })
        .isVisible(),
    ).resolves.toBe(true);
    await page.getByText('Compruebe que no es uno de estos cascos').scrollIntoViewIfNeeded();
    await page.screenshot({ path: path.join(shots, 'floor-spanish-receive-refused-1024.png') });
    await context.close();
  });

  it('when an operator reads Spanish, then the build sheet at 1024×768 is in Spanish, a wrong part in a slot is said in Spanish, and the navigation fits', async () => {
    const cookies = {
      receiving: await cookieFor(await makeUser('receiving'), served.t.config),
      operator: await cookieFor(await makeUser('operator'), served.t.config),
    };
    const parts = await tornDownCore(served.t, cookies, 'TARN-6');
    const { context, page } = await spanishTablet('operator');
    const nav = page.getByRole('navigation', { name: 'Main' });
    await nav.getByRole('link', { name: 'Armado' }).waitFor();
    expect(await headerProblems(page)).toEqual([]);
    await page.screenshot({ path: path.join(shots, 'floor-spanish-operator-nav-1024.png') });

    await page.goto(`${served.base}/build`);
    await page.getByRole('heading', { level: 1, name: 'Armado' }).waitFor();
    await page.getByLabel('Familia de motor').selectOption('TARN-6');
    await page.getByRole('complementary', { name: 'Seguridad: Piezas pesadas, pernos de estiramiento' }).waitFor();
    // the crankshaft scanned into the block's slot: the slot says so in Spanish before anything is sent
    const block = page.getByRole('textbox', { name: 'Bloque', exact: true });
    await block.fill(parts.crankshaft);
    await block.press('Enter');
    await page.getByText('No puede entrar tal como está').waitFor();
    await expect(page.getByText(`${parts.crankshaft} es cigüeñal, no bloque.`).isVisible()).resolves.toBe(true);
    await page.getByRole('heading', { name: 'Lotes comprados' }).waitFor();
    await page.screenshot({ path: path.join(shots, 'floor-spanish-build-1024.png'), fullPage: true });
    await floorChecks(page);
    await context.close();
  });
});
