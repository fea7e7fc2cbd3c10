import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  Characteristic,
  Customer,
  EngineFamily,
  Item,
  PartLot,
  Route,
  Shipment,
  Stage,
  StageResult,
  Station,
  Supplier,
  ToleranceRule,
  User,
} from '../../server/models/index.js';
import { LOT_KIND_LABELS, LOT_KINDS } from '../../shared/schemas/build.js';
import type { StationFormJson } from '../../shared/schemas/results.js';
import { TEST_PASSWORD, makeUser } from '../support/app.js';
import { givenSecondFactor, launch, serveApp, signIn, type Served } from '../support/browser.js';
import { emptyDatabase } from '../support/own-database.js';

/**
 * A plant that starts empty (SEED_DEMO=never: the migrations and nothing more) sets itself up
 * through the screens, then takes one core of its new family from the dock to the truck, with no
 * code change. Its definitions are the test's own, not the demo's. The people are made directly:
 * there is no screen for the very first administrator, and people are not the process.
 *
 * The walk, one `it` per step, each on the state the step before left (issue 16's acceptance):
 * 1. the administrator adds a family, a customer, a supplier, a hazardous stage and its characteristic;
 * 2. the administrator adds a part kind of the plant's own, the rest of the stages and characteristics;
 * 3. one quality engineer drafts a route for each part kind, a second approves each with a signature;
 * 4. the administrator adds a station for each stage;
 * 5. quality drafts the tolerance rules (one with size classes), the second engineer approves them;
 *    quality registers a gauge and records its calibration;
 * 6. the administrator signs the operator off for every stage;
 * 7. receiving receives the purchased lots a long block takes, accepted;
 * 8. receiving receives a core of the family at intake and tears it down;
 * 9. the operator records its block, crankshaft and head at each station on the tablet;
 * 10. the operator builds the long block, records assembly, run test and final inspection;
 *     shipping releases it with a signature.
 *
 * Every code is the test's own: the run test is the stage marked as the unit's run test when it is
 * added (the release gate reads the mark), and the finished bore is the block's characteristic whose
 * size class the pistons must match (the build's piston-to-bore check reads that mark).
 */
let served: Served;
let browser: Browser;
/** The administrator's page stays signed in from step to step (each sign-in asks for a fresh code). */
let adminPage: Page;
/** The people of the plant, made directly (see above). */
const people: Record<'quality' | 'approver' | 'receiving' | 'operator' | 'shipping', User> = {} as never;
let drop: (() => Promise<void>) | undefined;
const shots = path.resolve('test-results/e2e');

beforeAll(async () => {
  const db = await emptyDatabase('process_setup');
  drop = db.drop;
  served = await serveApp({ DATABASE_URL: db.url });
  browser = await launch();
  fs.mkdirSync(shots, { recursive: true });
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await served?.close();
  await drop?.();
});

describe('a plant set up from an empty database, through the screens', () => {
  it('when the database is empty, then an administrator adds a family, a customer, a supplier, a stage and its characteristic on the screens', async () => {
    // nothing of the demo's: no people, families, stages or parties
    expect([await User.count(), await EngineFamily.count(), await Stage.count(), await Customer.count()]).toEqual([
      0, 0, 0, 0,
    ]);
    const admin = await makeUser('admin', { name: 'Plant Administrator' });
    // the rest of the plant's people, none signed off for anything yet
    people.quality = await makeUser('quality', { name: 'Quinn Abara' });
    people.approver = await makeUser('quality', { name: 'Rosa Valdane' });
    people.receiving = await makeUser('receiving', { name: 'Dale Marsh' });
    people.operator = await makeUser('operator', { name: 'Ivo Brandt', qualified: false });
    people.shipping = await makeUser('shipping', { name: 'Nell Ashby' });
    await givenSecondFactor(admin.email, served.t.config);

    const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    const page = await context.newPage();
    await signIn(page, served.base, admin.email, TEST_PASSWORD);

    // an engine family of the test's own (invented figures)
    await page.goto(`${served.base}/admin/families`);
    await page.getByRole('button', { name: 'Add engine family' }).click();
    const family = page.getByRole('dialog');
    await family.getByRole('textbox', { name: 'Code', exact: true }).fill('WREN-4');
    await family.getByRole('textbox', { name: 'Name', exact: true }).fill('Wren inline four');
    await family.getByLabel('Layout').selectOption('inline');
    await family.getByRole('textbox', { name: 'Cylinders' }).fill('4');
    await family.getByRole('textbox', { name: 'Bore' }).fill('84');
    await family.getByRole('textbox', { name: 'Stroke' }).fill('90');
    await family.getByRole('textbox', { name: 'Heads' }).fill('1');
    await family.getByRole('textbox', { name: /^Warranty(?! distance)/ }).fill('12');
    await family.getByRole('button', { name: 'Add engine family' }).click();
    await family.waitFor({ state: 'hidden' });
    await page.getByRole('row').filter({ hasText: 'WREN-4' }).first().waitFor();

    // a customer and a supplier, on the page for them
    await page.goto(`${served.base}/admin/parties`);
    await page.getByRole('heading', { level: 1, name: 'Customers and suppliers' }).waitFor();
    await page.getByText('No customers yet. Add the first one above.').waitFor();
    const customers = page.getByRole('region', { name: 'Customers' });
    await customers.getByRole('textbox', { name: 'Customer code' }).fill('c300');
    await customers.getByRole('textbox', { name: 'Customer name' }).fill('Brookfield Fleet Works');
    await customers.getByRole('textbox', { name: 'E-mail' }).fill('orders@brookfield.example');
    await customers.getByRole('button', { name: 'Add customer' }).click();
    await customers.getByText('Added C300 — Brookfield Fleet Works.').waitFor();
    await customers.getByRole('cell', { name: 'Brookfield Fleet Works' }).waitFor();
    const suppliers = page.getByRole('region', { name: 'Suppliers' });
    await suppliers.getByRole('textbox', { name: 'Supplier code' }).fill('S400');
    await suppliers.getByRole('textbox', { name: 'Supplier name' }).fill('Kestrel Rings and Bearings');
    await suppliers.getByRole('button', { name: 'Add supplier' }).click();
    await suppliers.getByRole('cell', { name: 'Kestrel Rings and Bearings' }).waitFor();
    // a code taken is refused in words, and nothing is added
    await suppliers.getByRole('textbox', { name: 'Supplier code' }).fill('S400');
    await suppliers.getByRole('textbox', { name: 'Supplier name' }).fill('Someone else');
    await suppliers.getByRole('button', { name: 'Add supplier' }).click();
    await page.getByText('There is already a supplier with code S400.').waitFor();
    await page.screenshot({ path: path.join(shots, 'parties-1440.png'), fullPage: true });

    // a stage with its caution, on the process page
    await page.goto(`${served.base}/admin/process`);
    await page.getByRole('button', { name: 'Add stage' }).click();
    const stage = page.getByRole('dialog');
    await stage.getByRole('textbox', { name: 'Code', exact: true }).fill('wren-block-wash');
    await stage.getByRole('textbox', { name: 'Name', exact: true }).fill('Block hot wash');
    await stage.getByLabel('Part it works on').selectOption('block');
    await stage.getByLabel('This work can hurt someone').check();
    await stage.getByRole('textbox', { name: 'Caution shown at the station' }).fill('Caustic wash at 80 °C.');
    await stage.getByRole('button', { name: 'Add stage' }).click();
    await stage.waitFor({ state: 'hidden' });
    await page.getByText('Caustic wash at 80 °C.').waitFor();

    // a characteristic measured at each cylinder of that stage's block
    await page.getByRole('button', { name: 'Add characteristic' }).click();
    const char = page.getByRole('dialog');
    await char.getByLabel('Stage', { exact: true }).selectOption('wren-block-wash');
    await char.getByRole('textbox', { name: 'Code', exact: true }).fill('wren-bore');
    await char.getByRole('textbox', { name: 'Name', exact: true }).fill('Bore after wash');
    await char.getByLabel('Kind', { exact: true }).selectOption('variable');
    await char.getByLabel('Taken at').selectOption('cylinder');
    await char.getByLabel('Unit (measured only)').selectOption('mm');
    await char.getByRole('textbox', { name: 'Resolution (measured only)' }).fill('0.001');
    await char.getByRole('button', { name: 'Add characteristic' }).click();
    await char.waitFor({ state: 'hidden' });
    await page.getByText('Bore after wash').waitFor();

    expect(
      (await EngineFamily.findAll()).map((f) => [f.code, f.cylinders, Number(f.boreMm), f.headsPerEngine]),
    ).toEqual([['WREN-4', 4, 84, 1]]);
    expect((await Customer.findAll()).map((c) => [c.code, c.name, c.email])).toEqual([
      ['C300', 'Brookfield Fleet Works', 'orders@brookfield.example'],
    ]);
    expect((await Supplier.findAll()).map((s) => [s.code, s.name, s.email])).toEqual([
      ['S400', 'Kestrel Rings and Bearings', null],
    ]);
    expect((await Stage.findAll()).map((s) => [s.code, s.hazardous, s.hazard])).toEqual([
      ['wren-block-wash', true, 'Caustic wash at 80 °C.'],
    ]);
    const [bore] = await Characteristic.findAll({ where: { code: 'wren-bore' } });
    expect([bore?.kind, bore?.unit, Number(bore?.resolution)]).toEqual(['variable', 'mm', 0.001]);
    adminPage = page;
  }, 120_000);
  // the test's own process: stage code, name, part kind, and what is taken there
  // (characteristic code, name, kind, where, unit, resolution)
  const STAGES = [
    ['wren-hone', 'Wren bore finish', 'block'],
    ['wren-crank-check', 'Crank crack and journal check', 'crankshaft'],
    ['wren-head-check', 'Head pressure check', 'cylinder_head'],
    ['wren-assembly', 'Wren long-block assembly', 'long_block'],
    ['wren-stand-run', 'Wren stand run', 'long_block'],
    ['wren-final', 'Wren final look-over', 'long_block'],
  ] as const;
  const CHARACTERISTICS = [
    ['wren-hone', 'wren-bore-fin', 'Bore after honing', 'variable', 'cylinder', 'in', '0.0001'],
    ['wren-crank-check', 'wren-crank-crack', 'Crankshaft free of cracks', 'attribute', 'part'],
    ['wren-head-check', 'wren-head-leak', 'Head holds air pressure', 'attribute', 'part'],
    ['wren-assembly', 'wren-turns-free', 'Crank turns by hand', 'attribute', 'part'],
    ['wren-stand-run', 'wren-stand-leaks', 'No leaks on the stand', 'attribute', 'part'],
    ['wren-final', 'wren-final-look', 'Paint, plugs and tags in order', 'attribute', 'part'],
  ] as const;
  const ROUTES = [
    ['block', 'Block', ['wren-block-wash', 'wren-hone']],
    ['crankshaft', 'Crankshaft', ['wren-crank-check']],
    ['cylinder_head', 'Cylinder head', ['wren-head-check']],
    ['long_block', 'Long block', ['wren-assembly', 'wren-stand-run', 'wren-final']],
  ] as const;
  const STATIONS = [
    ['WW-1', 'Wren wash tank', 'wren-block-wash'],
    ['WB-1', 'Wren hone bench', 'wren-hone'],
    ['WC-1', 'Crank inspection bench', 'wren-crank-check'],
    ['WH-1', 'Head test rig', 'wren-head-check'],
    ['WA-1', 'Wren assembly stand', 'wren-assembly'],
    ['WR-1', 'Wren run stand', 'wren-stand-run'],
    ['WF-1', 'Wren final bench', 'wren-final'],
  ] as const;
  const GAUGE = 'WG-101';
  let quality: Page;
  let approver: Page;
  let receiving: Page;
  let operator: Page;
  const parts = { core: '', block: '', crankshaft: '', head: '', unit: '' };

  async function session(user: User): Promise<Page> {
    const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    const p = await context.newPage();
    await signIn(p, served.base, user.email, TEST_PASSWORD);
    return p;
  }

  it('then the administrator adds a part kind of the plant’s own, and the stages and characteristics of every part', async () => {
    const page = adminPage;
    await page.goto(`${served.base}/admin/process`);
    await page.getByRole('button', { name: 'Add part kind' }).click();
    const kind = page.getByRole('dialog');
    await kind.getByRole('textbox', { name: 'Code', exact: true }).fill('wren_sump');
    await kind.getByRole('textbox', { name: 'Name', exact: true }).fill('Wren oil sump');
    await kind.getByLabel('Each part gets its own serial').uncheck();
    await kind.getByRole('button', { name: 'Add part kind' }).click();
    await kind.waitFor({ state: 'hidden' });
    await page.getByRole('cell', { name: 'Wren oil sump' }).waitFor();

    for (const [code, name, part] of STAGES) {
      await page.getByRole('button', { name: 'Add stage' }).click();
      const d = page.getByRole('dialog');
      await d.getByRole('textbox', { name: 'Code', exact: true }).fill(code);
      await d.getByRole('textbox', { name: 'Name', exact: true }).fill(name);
      await d.getByLabel('Part it works on').selectOption(part);
      if (code === 'wren-stand-run') await d.getByLabel(/This is the unit's run test/).check();
      await d.getByRole('button', { name: 'Add stage' }).click();
      await d.waitFor({ state: 'hidden' });
    }
    for (const [stage, code, name, kindOf, per, unit, resolution] of CHARACTERISTICS) {
      await page.getByRole('button', { name: 'Add characteristic' }).click();
      const d = page.getByRole('dialog');
      await d.getByLabel('Stage', { exact: true }).selectOption(stage);
      await d.getByRole('textbox', { name: 'Code', exact: true }).fill(code);
      await d.getByRole('textbox', { name: 'Name', exact: true }).fill(name);
      await d.getByLabel('Kind', { exact: true }).selectOption(kindOf);
      await d.getByLabel('Taken at').selectOption(per);
      if (unit) {
        await d.getByLabel('Unit (measured only)').selectOption(unit);
        await d.getByRole('textbox', { name: 'Resolution (measured only)' }).fill(resolution!);
      }
      // the finished bore is what the build matches the pistons' oversize to
      if (code === 'wren-bore-fin') await d.getByLabel('Size class matches (measured only)').selectOption('pistons');
      await d.getByRole('button', { name: 'Add characteristic' }).click();
      await d.waitFor({ state: 'hidden' });
      await page.getByText(name).first().waitFor();
    }
    await page.screenshot({ path: path.join(shots, 'setup-process-1440.png'), fullPage: true });
    expect((await Stage.findAll({ order: [['id', 'ASC']] })).map((s) => [s.code, s.partKind])).toEqual([
      ['wren-block-wash', 'block'],
      ...STAGES.map(([code, , part]) => [code, part]),
    ]);
    expect((await Stage.findAll({ where: { runTest: true } })).map((s) => s.code)).toEqual(['wren-stand-run']);
    expect(await Characteristic.count()).toBe(1 + CHARACTERISTICS.length);
  }, 120_000);

  it('then one quality engineer drafts a route for each part kind, and a second approves each with a signature', async () => {
    quality = await session(people.quality);
    await quality.goto(`${served.base}/admin/routes?family=WREN-4`);
    await quality.getByText('No routes for WREN-4 yet. Draft the first one.').waitFor();
    for (const [kind, , stages] of ROUTES) {
      await quality.getByRole('button', { name: 'Draft a route' }).click();
      const d = quality.getByRole('dialog');
      await d.getByLabel('Part kind').selectOption(kind);
      for (const [i, stage] of stages.entries()) {
        await d.getByRole('button', { name: 'Add a stage' }).click();
        await d.getByLabel(`Stage ${i + 1}`, { exact: true }).selectOption(stage);
      }
      await d.getByLabel('What changes and why').fill(`First route of the ${kind.replace('_', ' ')} of WREN-4`);
      await d.getByRole('button', { name: 'Save draft' }).click();
      await d.waitFor({ state: 'hidden' });
    }
    // the author cannot approve a draft of their own: the page says so in words instead of offering
    // the button, and the server still refuses the author's signature in words
    const own = quality.getByRole('region', { name: 'Long block', exact: true });
    await own.getByText('Someone else approves this draft.').waitFor();
    expect(await own.getByRole('button', { name: 'Approve version 1' }).count()).toBe(0);
    const draftId = (await Route.findOne({ where: { partKind: 'long_block', status: 'draft' } }))!.id;
    const refused = await quality.request.post(`${served.base}/api/process/routes/${draftId}/approve`, {
      data: { reason: 'Ready to use', password: TEST_PASSWORD },
    });
    expect([refused.status(), (await refused.json()).error.message]).toEqual([
      403,
      'You drafted this version: someone else must approve it.',
    ]);
    expect(await Route.count({ where: { status: 'approved' } })).toBe(0);

    approver = await session(people.approver);
    await approver.goto(`${served.base}/admin/routes?family=WREN-4`);
    for (const [, title] of ROUTES) {
      const card = approver.getByRole('region', { name: title, exact: true });
      await card.getByRole('button', { name: 'Approve version 1' }).click();
      const d = approver.getByRole('dialog');
      await d.getByRole('textbox', { name: 'Reason' }).fill('Matches the shop’s written process for the Wren four');
      await d.getByLabel('Your password, to sign').fill(TEST_PASSWORD);
      await d.getByRole('button', { name: 'Approve and sign' }).click();
      await d.waitFor({ state: 'hidden' });
      await card.getByText('In force').waitFor();
    }
    await approver.screenshot({ path: path.join(shots, 'setup-routes-1440.png'), fullPage: true });
    const routes = await Route.findAll({ where: { active: true } });
    expect(routes.map((r) => r.partKind).sort()).toEqual(['block', 'crankshaft', 'cylinder_head', 'long_block']);
  }, 180_000);

  it('then the administrator puts a station at every stage', async () => {
    const page = adminPage;
    await page.goto(`${served.base}/admin/stations`);
    for (const [code, name, stage] of STATIONS) {
      await page.getByRole('button', { name: 'Add station' }).click();
      const d = page.getByRole('dialog');
      await d.getByRole('textbox', { name: 'Code', exact: true }).fill(code);
      await d.getByRole('textbox', { name: 'Name', exact: true }).fill(name);
      await d.getByLabel('Stage it records').selectOption(stage);
      await d.getByRole('textbox', { name: 'Location' }).fill('Bay 2');
      await d.getByRole('button', { name: 'Add station' }).click();
      await d.waitFor({ state: 'hidden' });
      await page.getByText(name).first().waitFor();
    }
    await page.screenshot({ path: path.join(shots, 'setup-stations-1440.png'), fullPage: true });
    expect(await Station.count()).toBe(STATIONS.length);
  }, 120_000);

  it('then quality drafts the tolerance rules, one with size classes, the second engineer approves them, and a gauge is registered and calibrated', async () => {
    const family = (await EngineFamily.findOne({ where: { code: 'WREN-4' } }))!;
    // invented figures for the test's own family, in the way of common practice: an 84 mm bore
    // washed to within 0.05 mm, honed to standard or to 0.020 in over (3.3071 in is 84 mm)
    const rules = [
      { code: 'wren-bore', nominal: '84', plus: '0.05', resolution: '0.001', classes: [] as string[][] },
      {
        code: 'wren-bore-fin',
        nominal: '3.3071',
        plus: '0.001',
        resolution: '0.0001',
        classes: [
          ['STD', 'Standard bore', '3.3071'],
          ['OS20', '0.020 in over', '3.3271'],
        ],
      },
    ];
    for (const r of rules) {
      const c = (await Characteristic.findOne({ where: { code: r.code } }))!;
      await quality.goto(`${served.base}/spec/WREN-4/${c.id}`);
      await quality.getByRole('heading', { level: 1, name: c.name }).waitFor();
      await quality.getByRole('button', { name: 'Start a draft' }).click();
      await quality.getByRole('textbox', { name: 'Nominal' }).fill(r.nominal);
      await quality.getByRole('textbox', { name: 'Minus tolerance' }).fill('0');
      await quality.getByRole('textbox', { name: 'Plus tolerance' }).fill(r.plus);
      await quality.getByRole('textbox', { name: 'Resolution' }).fill(r.resolution);
      for (const [i, [code, name, nominal]] of r.classes.entries()) {
        await quality.getByRole('button', { name: 'Add a size class' }).click();
        await quality.getByRole('textbox', { name: `Size class ${i + 1} code` }).fill(code!);
        await quality.getByRole('textbox', { name: `Size class ${i + 1} name` }).fill(name!);
        await quality.getByRole('textbox', { name: `Size class ${i + 1} nominal` }).fill(nominal!);
        await quality.getByRole('textbox', { name: `Size class ${i + 1} minus tolerance` }).fill('0');
        await quality.getByRole('textbox', { name: `Size class ${i + 1} plus tolerance` }).fill(r.plus);
      }
      await quality.getByRole('textbox', { name: 'Source note' }).fill('Wren four shop manual, invented for this test');
      await quality.getByRole('button', { name: 'Save draft' }).click();
      await quality.getByText('You drafted this version').waitFor();

      await approver.goto(`${served.base}/spec/WREN-4/${c.id}`);
      await approver.getByRole('button', { name: 'Approve…' }).first().click();
      const d = approver.getByRole('dialog');
      await d.getByRole('textbox', { name: 'Reason' }).fill('First limits of the Wren four');
      await d.getByLabel('Password').fill(TEST_PASSWORD);
      await d.getByRole('button', { name: 'Sign and approve' }).click();
      await approver.getByText('Version 1 in force').first().waitFor();
    }
    await approver.screenshot({ path: path.join(shots, 'setup-rule-size-classes-1440.png'), fullPage: true });
    const bore = (await Characteristic.findOne({ where: { code: 'wren-bore-fin' } }))!;
    const rule = (await ToleranceRule.findOne({ where: { characteristicId: bore.id, engineFamilyId: family.id } }))!;
    expect([rule.status, rule.sizeClasses.map((k: { code: string }) => k.code)]).toEqual(['approved', ['STD', 'OS20']]);

    // the bore gauge, registered on the register's page, then its first calibration
    await quality.goto(`${served.base}/gauges`);
    await quality.getByRole('button', { name: 'Add gauge' }).click();
    const g = quality.getByRole('dialog');
    await g.getByRole('textbox', { name: 'Code', exact: true }).fill(GAUGE);
    await g.getByRole('textbox', { name: 'Description' }).fill('Dial bore gauge, 75–100 mm');
    await g.getByRole('textbox', { name: 'Kind of gauge' }).fill('bore gauge');
    await g.getByRole('textbox', { name: 'Unit it reads in' }).fill('mm');
    await g.getByRole('textbox', { name: 'Resolution' }).fill('0.001');
    await g.getByRole('textbox', { name: 'Range from' }).fill('75');
    await g.getByRole('textbox', { name: 'Range to' }).fill('100');
    await g.getByRole('textbox', { name: 'Calibration interval (days)' }).fill('180');
    await quality.screenshot({ path: path.join(shots, 'setup-add-gauge-1440.png') });
    await g.getByRole('button', { name: 'Add gauge' }).click();
    await quality.getByRole('heading', { level: 1, name: new RegExp(GAUGE) }).waitFor();
    const cal = quality.getByRole('form', { name: 'Record a calibration' });
    await cal.getByLabel('Technician or laboratory').fill('Gauge room, setting ring');
    await cal.getByLabel('Reference (point 1)').fill('84');
    await cal.getByLabel('As found (point 1)').fill('84.001');
    await cal.getByLabel('As left (point 1)').fill('84');
    await cal.getByLabel('Permitted error ± (point 1)').fill('0.002');
    await cal.getByRole('button', { name: 'Record the calibration' }).click();
    await quality.getByText('Calibration recorded').waitFor();
    await quality.screenshot({ path: path.join(shots, 'setup-gauge-1440.png'), fullPage: true });
  }, 180_000);

  it('then the administrator signs the operator off for every stage', async () => {
    const page = adminPage;
    await page.goto(`${served.base}/admin/qualifications`);
    const form = page.getByRole('region', { name: 'Sign someone off' });
    for (const [, , stage] of STATIONS) {
      const name = (await Stage.findOne({ where: { code: stage } }))!.name;
      await form.getByLabel('Person').selectOption(String(people.operator.id));
      await form.getByLabel('Stage', { exact: true }).selectOption(stage);
      await form.getByRole('textbox', { name: 'Training' }).fill(`Shown ${name} at the station, procedure WR-${stage}`);
      await form.getByRole('button', { name: 'Sign off…' }).click();
      const d = page.getByRole('dialog');
      await d.getByLabel('Password').fill(TEST_PASSWORD);
      await d.getByRole('button', { name: 'Sign off' }).click();
      await form.getByText(`Ivo Brandt may record ${name} until`).waitFor();
    }
    await page.screenshot({ path: path.join(shots, 'setup-qualifications-1440.png'), fullPage: true });
  }, 180_000);

  it('then receiving receives the purchased lots a long block takes, inspected and accepted', async () => {
    receiving = await session(people.receiving);
    for (const kind of LOT_KINDS) {
      await receiving.goto(`${served.base}/receiving/lots/new`);
      await receiving.getByLabel('Supplier').selectOption({ label: 'Kestrel Rings and Bearings' });
      await receiving.getByLabel('Part', { exact: true }).selectOption(kind);
      await receiving.getByRole('textbox', { name: 'Part number' }).fill(`KRB-${kind.toUpperCase().replace(/_/g, '')}`);
      await receiving.getByRole('textbox', { name: 'Lot code' }).fill(`K26-${kind.toUpperCase().replace(/_/g, '')}`);
      await receiving.getByRole('textbox', { name: 'Quantity received' }).fill(kind === 'pistons' ? '16' : '4');
      if (kind === 'pistons') await receiving.getByRole('textbox', { name: 'Oversize (in)' }).fill('0.020');
      await receiving.getByLabel('Inspection').selectOption('accepted');
      await receiving.getByRole('button', { name: 'Receive lot' }).click();
      await receiving.waitForURL(/\/receiving\/lots\/\d+/);
    }
    await receiving.screenshot({ path: path.join(shots, 'setup-lot-1440.png'), fullPage: true });
    expect((await PartLot.findAll()).map((l) => [l.partKind, l.inspection]).sort()).toEqual(
      LOT_KINDS.map((k) => [k, 'accepted']).sort(),
    );
  }, 180_000);

  it('then receiving receives a core of the family at intake and tears it down into its parts', async () => {
    const family = (await EngineFamily.findOne({ where: { code: 'WREN-4' } }))!;
    const customer = (await Customer.findOne({ where: { code: 'C300' } }))!;
    await receiving.goto(`${served.base}/intake/new`);
    await receiving.getByLabel('Engine family').selectOption(String(family.id));
    await receiving.getByLabel('Casting number', { exact: true }).fill('WR4 1180-A');
    await receiving.getByLabel('ID number').fill('WREN-0001');
    await receiving.getByLabel('Customer', { exact: true }).selectOption(String(customer.id));
    await receiving.getByLabel('Return reference').fill('BFW-RMA-77');
    await receiving.getByLabel('Core credit').selectOption('full');
    await receiving.getByLabel('Grade').selectOption('sound');
    await receiving.getByRole('radio', { name: 'Accept' }).check();
    await receiving.getByRole('button', { name: 'Receive core' }).click();
    await receiving.waitForURL(/\/cores\/CR-/);
    parts.core = decodeURIComponent(receiving.url().split('/cores/')[1]!.split(/[?#]/)[0]!);

    await receiving.goto(`${served.base}/teardown`);
    await receiving.getByLabel('Serial').fill(parts.core);
    await receiving.getByLabel('Serial').press('Enter');
    for (const name of ['Keep Block', 'Keep Crankshaft', 'Keep Cylinder head']) {
      await receiving.getByRole('radio', { name }).or(receiving.getByRole('button', { name })).first().click();
    }
    await receiving.getByRole('button', { name: 'Record teardown' }).click();
    await receiving
      .getByRole('button', { name: 'Print labels for these parts' })
      .or(receiving.getByRole('link', { name: 'Print labels for these parts' }))
      .first()
      .waitFor();
    await receiving.screenshot({ path: path.join(shots, 'setup-teardown-1440.png'), fullPage: true });
    const serialOf = async (kind: string) => (await Item.findOne({ where: { kind } }))!.serial;
    parts.block = await serialOf('block');
    parts.crankshaft = await serialOf('crankshaft');
    parts.head = await serialOf('cylinder_head');
  }, 120_000);

  /** The operator at a station's tablet: the part scanned, every box typed, the result recorded. */
  async function record(
    station: string,
    serial: string,
    { value, sizeClass, typeIn, shot }: { value?: string; sizeClass?: string; typeIn?: string; shot?: string } = {},
  ) {
    const p = operator;
    await p.goto(`${served.base}/station`);
    await p.evaluate((s) => localStorage.setItem('coretrail.station', s), station);
    await p.goto(`${served.base}/station?serial=${serial}`);
    // the form's boxes, as the tablet reads them, to know each box's name
    const res = await p.request.get(`${served.base}/api/stations/${station}/form?serial=${encodeURIComponent(serial)}`);
    expect(res.status(), await res.text()).toBe(200);
    const form = (await res.json()) as StationFormJson;
    for (const c of form.characteristics) {
      // the operator types in the rule's own unit (their profile's inch system is the default)
      if (typeIn && c.kind === 'variable') await p.getByLabel('Type in').selectOption(typeIn);
      if (sizeClass && c.kind === 'variable') {
        await p.getByRole('combobox', { name: `${c.name}: size class finished to` }).selectOption(sizeClass);
      }
      for (const pos of c.positions) {
        const name = `${c.name}, ${pos.label}`;
        if (c.kind === 'attribute') {
          await p.getByRole('radiogroup', { name, exact: true }).getByRole('radio', { name: 'Pass' }).check();
        } else {
          await p.getByRole('textbox', { name, exact: true }).fill(value!);
        }
      }
    }
    if (form.characteristics.some((c) => c.kind === 'variable')) {
      await p.getByLabel('Gauge used').selectOption(GAUGE);
    }
    if (shot) await p.screenshot({ path: path.join(shots, shot), fullPage: true });
    await p.getByRole('button', { name: 'Record result' }).click();
    await p.getByRole('heading', { level: 2, name: 'Passed' }).waitFor();
  }

  it('then the operator records the block, the crankshaft and the head at each of their stations', async () => {
    operator = await session(people.operator);
    await record('WW-1', parts.block, { value: '84.020', typeIn: 'mm' });
    await operator.screenshot({ path: path.join(shots, 'setup-station-wash-1440.png'), fullPage: true });
    // honed 0.020 in over: the operator says so, and the bores are judged to that class
    await record('WB-1', parts.block, {
      value: '3.3275',
      sizeClass: 'OS20',
      typeIn: 'in',
      shot: 'setup-station-bore-1440.png',
    });
    await record('WC-1', parts.crankshaft);
    await record('WH-1', parts.head);
    const block = (await Item.findOne({ where: { serial: parts.block } }))!;
    const honed = (await StageResult.findOne({ where: { itemId: block.id }, order: [['id', 'DESC']] }))!;
    expect(honed.sizeClasses['wren-bore-fin']).toMatchObject({ code: 'OS20', name: '0.020 in over' });
  }, 180_000);

  it('then the operator builds the long block, takes it through assembly, run test and final, and shipping releases it', async () => {
    const op = operator;
    await op.goto(`${served.base}/build`);
    await op.getByLabel('Engine family').selectOption({ label: 'WREN-4 — Wren inline four' });
    const scan = async (name: string, serial: string) => {
      const box = op.getByRole('textbox', { name, exact: true });
      await box.fill(serial);
      await box.press('Enter');
    };
    await scan('Block', parts.block);
    await scan('Crankshaft', parts.crankshaft);
    await scan('Cylinder head', parts.head);
    for (const kind of LOT_KINDS) {
      const label = LOT_KIND_LABELS[kind];
      await op.getByLabel(`${label} supplier`).selectOption({ label: 'Kestrel Rings and Bearings' });
      await op.getByLabel(`${label} part number`).fill(`KRB-${kind.toUpperCase().replace(/_/g, '')}`);
      await op.getByLabel(`${label} lot code`).fill(`K26-${kind.toUpperCase().replace(/_/g, '')}`);
    }
    await op.getByLabel('Pistons oversize (in)').fill('0.020');
    // the pistons' class as on their box: the build matches it to the class the block was finished to
    await op.getByLabel('Pistons size class').fill('OS20');
    await op.getByRole('button', { name: 'Start long block' }).click();
    await expect.poll(async () => (await Item.findOne({ where: { kind: 'long_block' } }))?.serial ?? '').not.toBe('');
    parts.unit = (await Item.findOne({ where: { kind: 'long_block' } }))!.serial;
    await op.getByText(parts.unit).first().waitFor();
    await op.screenshot({ path: path.join(shots, 'setup-built-1440.png'), fullPage: true });
    await record('WA-1', parts.unit);
    await record('WR-1', parts.unit);
    await record('WF-1', parts.unit);

    const s = await session(people.shipping);
    await s.goto(`${served.base}/release?serial=${parts.unit}`);
    await s.getByLabel('Customer').selectOption({ label: 'Brookfield Fleet Works (C300)' });
    await s.getByLabel('Order reference').fill('BFW-SO-1001');
    await s.getByText('released for shipment').first().waitFor();
    // the gate saw the run test by its stage's code, and every stage of the unit and its parts passed
    const gate = s.getByRole('list', { name: 'Release gate checks' });
    for (const label of [
      'The run test passed',
      'Every required stage of the unit and its parts has a current passing result',
    ]) {
      const text = await gate.getByRole('listitem').filter({ hasText: label }).textContent();
      expect([text?.includes('Met'), text?.includes('Not met')]).toEqual([true, false]);
    }
    await s.screenshot({ path: path.join(shots, 'setup-release-gate-1440.png'), fullPage: true });
    await s.getByLabel('Password').fill(TEST_PASSWORD);
    await s.getByRole('button', { name: 'Sign, release and ship' }).click();
    await s.getByText('BFW-SO-1001').first().waitFor();
    await s.screenshot({ path: path.join(shots, 'setup-released-1440.png'), fullPage: true });
    const unit = (await Item.findOne({ where: { serial: parts.unit } }))!;
    expect((await Shipment.findOne({ where: { reference: 'BFW-SO-1001' } }))!.unitItemId).toBe(unit.id);
  }, 180_000);
});
