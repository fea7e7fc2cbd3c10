import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import AxeBuilder from '@axe-core/playwright';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { Op, QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nominalSizeClasses, passingReadings } from '../../db/seeders/sample-readings.js';
import { DEMO_USERS } from '../../db/seeders/plant.js';
import { readMailSink, startMailSink } from '../../server/mail/sink.js';
import { Customer, Item, Signature } from '../../server/models/index.js';
import { TEST_PASSWORD, cookieFor, makeUser, unique } from '../support/app.js';
import { deliverMailSince, launch, newestMailId, serveApp, signIn, type Served } from '../support/browser.js';
import {
  CRANK_STATIONS,
  HEAD_STATIONS,
  formFor,
  gaugesOf,
  lotsFor,
  passThrough,
  plantToday,
  tornDownCore,
} from '../support/parts.js';
import { AIAG_READINGS } from '../unit/fixtures/msa-aiag.js';
import { chooseStation } from '../support/station-ui.js';

/**
 * Measurement in the browser. A bore gauge of this file's own reads the bores of TARN-6 blocks (the
 * demo's six-cylinder): one block goes into a unit that ships to a customer, one stays in the
 * plant. Quality records its calibration out of tolerance as found, reads the blast radius, holds
 * what is in the plant in one signed step and drafts the customer notice, which reaches the mail
 * sink; the station then no longer offers the gauge. And quality enters a gauge R&R study on the
 * tablet grid, sees both methods' figures with their bands, records and signs it.
 */

let served: Served;
let browser: Browser;
let sink: Awaited<ReturnType<typeof startMailSink>>;
let firstMail: string;
let cookies: { receiving: string; operator: string };
let quality: string;
let shipping: string;
const shots = path.resolve('test-results/e2e');
const demo = (role: string) => DEMO_USERS.find((u) => u.role === role)!;

beforeAll(async () => {
  served = await serveApp();
  browser = await launch();
  fs.mkdirSync(shots, { recursive: true });
  sink = await startMailSink({ port: 0, dir: fs.mkdtempSync(path.join(os.tmpdir(), 'coretrail-e2e-sink-')) });
  firstMail = await newestMailId(served.t.sequelize);
  cookies = {
    receiving: await cookieFor(await makeUser('receiving'), served.t.config),
    operator: await cookieFor(await makeUser('operator'), served.t.config),
  };
  quality = await cookieFor(await makeUser('quality', { quickSignature: true }), served.t.config);
  shipping = await cookieFor(await makeUser('shipping', { quickSignature: true }), served.t.config);
}, 60_000);
afterAll(async () => {
  await sink?.close();
  await browser?.close();
  await served?.close();
});

const post = (cookie: string, url: string, body: object) =>
  request(served.t.app).post(url).set('Cookie', cookie).send(body);

/** A calibrated bore gauge of this file's own (3–6 in, 0.0001 in), so no other file's readings are touched. */
async function boreGauge(description: string) {
  const code = `ZE-${randomUUID().slice(0, 6).toUpperCase()}`;
  const reg = await post(quality, '/api/gauges', {
    code,
    description,
    kind: 'bore gauge',
    serial: unique('SN'),
    unit: 'in',
    resolution: 0.0001,
    rangeLow: 3,
    rangeHigh: 6,
    location: 'Bore & hone cell',
    owner: 'Quality',
    intervalDays: 180,
  });
  if (reg.status !== 201) throw new Error(JSON.stringify(reg.body));
  const cal = await post(quality, `/api/gauges/${code}/calibrations`, {
    calibratedOn: plantToday(),
    performedBy: 'in_house',
    performer: 'Gauge room',
    points: [{ reference: 3.5, asFound: 3.5, asLeft: 3.5, tolerance: 0.0001 }],
  });
  if (cal.status !== 201) throw new Error(JSON.stringify(cal.body));
  return code;
}

/** Passes a block through its stations, the bores read at BH-1 with `gauge`. */
async function bore(stations: string[], serial: string, gauge: string) {
  for (const s of stations) {
    const form = await formFor(served.t, cookies.operator, s, serial);
    const res = await post(cookies.operator, '/api/results', {
      idempotencyKey: randomUUID(),
      serial,
      station: s,
      ...gaugesOf(form),
      ...(s === 'BH-1' ? { gauge } : {}),
      readings: passingReadings(form),
      sizeClasses: nominalSizeClasses(form),
    });
    if (res.status !== 201 || res.body.verdict !== 'pass') throw new Error(`${s}: ${JSON.stringify(res.body)}`);
  }
}

async function touchContext(): Promise<BrowserContext> {
  return browser.newContext({ viewport: { width: 1024, height: 768 }, hasTouch: true, isMobile: false });
}

/** Controls a finger is meant to hit, inside `selector`, that are under 48 px either way. */
const smallTargets = (page: Page, selector: string) =>
  page.evaluate(
    (sel) =>
      [...document.querySelectorAll(`${sel} input, ${sel} button, ${sel} select`)]
        .map((el) => el.getBoundingClientRect())
        .filter((r) => r.width > 1 && r.height > 1 && (r.width < 48 || r.height < 48)).length,
    selector,
  );

describe('a bore gauge found out of tolerance, in the browser', () => {
  it('quality records it, the blast radius lists readings, parts, units and customers, one signed step holds the plant’s, the notice is mailed, the station stops offering it', async () => {
    const gauge = await boreGauge('Dial bore gauge 3–6 in (browser test)');
    const customer = (await Customer.findOne({ where: { email: { [Op.ne]: null } }, order: [['id', 'DESC']] }))!;
    // one block bored with the gauge goes into a unit that ships
    const shippedParts = await tornDownCore(served.t, cookies, 'TARN-6');
    await bore(['CLN-1', 'MPI-1', 'PT-1', 'LH-1', 'BH-1', 'DK-1', 'WSH-1'], shippedParts.block, gauge);
    await passThrough(served.t, cookies.operator, CRANK_STATIONS, shippedParts.crankshaft);
    for (const h of shippedParts.heads) await passThrough(served.t, cookies.operator, HEAD_STATIONS, h);
    const built = await post(cookies.operator, '/api/units', {
      family: 'TARN-6',
      block: shippedParts.block,
      crankshaft: shippedParts.crankshaft,
      heads: shippedParts.heads,
      lots: await lotsFor(0.0197, `E${randomUUID().slice(0, 5).toUpperCase()}`),
    });
    expect(built.status, JSON.stringify(built.body)).toBe(201);
    const unit = built.body.serial as string;
    await passThrough(served.t, cookies.operator, ['AS-1', 'RT-1', 'FI-1'], unit);
    const shipped = await post(shipping, `/api/units/${unit}/release`, {
      customerId: customer.id,
      reference: `SO-${unit}`,
      shipDate: plantToday(),
      password: TEST_PASSWORD,
    });
    expect(shipped.status, JSON.stringify(shipped.body)).toBe(201);
    // another stays in the plant, after bore and hone
    const inPlant = await tornDownCore(served.t, cookies, 'TARN-6');
    await bore(['CLN-1', 'MPI-1', 'PT-1', 'LH-1', 'BH-1'], inPlant.block, gauge);

    const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    const page = await context.newPage();
    const q = demo('quality');
    await signIn(page, served.base, q.email, q.password);

    // — the calibration: found 0.0004 in high at 3.5 in, permitted ± 0.0001 —
    await page.goto(`${served.base}/gauges/${gauge}`);
    await page.getByRole('heading', { level: 1, name: new RegExp(gauge) }).waitFor();
    const cal = page.getByRole('form', { name: 'Record a calibration' });
    await cal.getByLabel('Technician or laboratory').fill('Gauge room, J. Test');
    await cal.getByLabel('Reference (point 1)').fill('3.5');
    await cal.getByLabel('As found (point 1)').fill('3.5004');
    await cal.getByLabel('As left (point 1)').fill('3.5');
    await cal.getByLabel('Permitted error ± (point 1)').fill('0.0001');
    await cal.getByRole('button', { name: 'Record the calibration' }).click();
    await page.getByText(/OUT OF TOLERANCE as found \(off by up to 0.0004 in\)/).waitFor();
    await page.evaluate(() => window.scrollTo(0, 0));
    await page.screenshot({ path: path.join(shots, 'gauge-out-of-tolerance-1440.png'), fullPage: true });

    // — the blast radius —
    await page.getByRole('link', { name: 'What did it measure?' }).click();
    const partsTable = page.getByRole('table', { name: 'Parts measured, and where each is now' });
    await partsTable.getByText(shippedParts.block).waitFor();
    await expect(partsTable.getByText(inPlant.block).count()).resolves.toBeGreaterThan(0);
    await expect(partsTable.getByText(unit).count()).resolves.toBeGreaterThan(0);
    const readings = page.getByRole('table', { name: /readings, most doubtful first/ });
    await expect(readings.getByText(shippedParts.block).count()).resolves.toBeGreaterThan(0);
    // the count on screen is every reading the gauge took, as the database holds them
    const [{ n }] = (await served.t.sequelize.query(
      'SELECT count(*)::int AS n FROM readings r JOIN gauges g ON g.id = r.gauge_id WHERE g.code = :gauge',
      { replacements: { gauge }, type: QueryTypes.SELECT },
    )) as [{ n: number }];
    expect(n).toBeGreaterThanOrEqual(2 * 36); // at least the bores of both blocks: 6 cylinders × 3 depths × 2 axes each
    await expect(page.getByText(new RegExp(`The first \\d+ of ${n} readings`)).count()).resolves.toBe(1);
    const shippedTo = page.getByRole('region', { name: 'Shipped to' });
    await shippedTo.getByText(customer.name).waitFor();
    await expect(shippedTo.getByText(unit).count()).resolves.toBeGreaterThan(0);
    await page.evaluate(() => window.scrollTo(0, 0));
    await page.screenshot({ path: path.join(shots, 'blast-radius-1440.png'), fullPage: true });

    // — one signed step —
    const hold = page.getByRole('form', { name: 'Hold and open field actions' });
    await hold.getByLabel('Reason').fill('Bore gauge found 0.0004 in high as found');
    await hold.getByLabel('Password (your signature)').fill(q.password);
    await hold.getByRole('button', { name: 'Sign and hold' }).click();
    const signed = page.getByText(/Containment CT-\d{4}-\d{5,} signed by /);
    await signed.waitFor();
    const number = /CT-\d{4}-\d{5,}/.exec((await signed.textContent())!)![0];
    expect((await Item.findOne({ where: { serial: inPlant.block } }))!.status).toBe('on_hold');
    expect((await Item.findOne({ where: { serial: shippedParts.block } }))!.status).not.toBe('on_hold');
    const sig = await Signature.findOne({ where: { entity: 'containment', entityId: number } });
    expect(sig).toMatchObject({ printedName: q.name, reason: 'Bore gauge found 0.0004 in high as found' });

    // — the customer notice, through the outbox to the sink —
    await page
      .getByRole('form', { name: 'Customer notice' })
      .getByRole('button', { name: 'Draft the customer notice' })
      .click();
    await page.getByText(/1 notice\(s\) queued in the mail outbox/).waitFor();
    await page.evaluate(() => window.scrollTo(0, 0));
    await page.screenshot({ path: path.join(shots, 'blast-radius-contained-1440.png'), fullPage: true });
    // what was queued since this file began for that customer, and only that: the other suites share the outbox
    await deliverMailSince(served.t.sequelize, sink.port, firstMail, [customer.email!]);
    const mails = readMailSink(sink.dir, Number.MAX_SAFE_INTEGER).filter(
      (m) => m.to.includes(customer.email!) && m.subject === `Notice about engine ${unit} we shipped to you`,
    );
    expect(mails).toHaveLength(1);
    expect(mails[0]!.text).toContain(number);
    await context.close();

    // — the station, on a tablet: the gauge is listed as not usable, with the reason —
    const fresh = await tornDownCore(served.t, cookies, 'TARN-6');
    await passThrough(served.t, cookies.operator, ['CLN-1', 'MPI-1', 'PT-1', 'LH-1'], fresh.block);
    const tablet = await touchContext();
    const floor = await tablet.newPage();
    const op = demo('operator');
    await signIn(floor, served.base, op.email, op.password);
    await floor.goto(`${served.base}/station`);
    await chooseStation(floor, 'BH-1');
    await floor.goto(`${served.base}/station?serial=${fresh.block}`);
    const picker = floor.getByLabel('Gauge used');
    await picker.waitFor();
    const option = picker.locator(`option[value="${gauge}"]`);
    await expect(option.isDisabled()).resolves.toBe(true);
    await expect(option.textContent()).resolves.toMatch(/cannot be used: Found out of tolerance/);
    await expect(picker.inputValue()).resolves.not.toBe(gauge);
    await floor.getByText(new RegExp(`Not usable now: .*${gauge} \\(Found out of tolerance`)).waitFor();
    await picker.scrollIntoViewIfNeeded();
    await floor.screenshot({ path: path.join(shots, 'station-gauge-out-1024-touch.png') });
    await tablet.close();
  }, 180_000);
});

describe('a gauge R&R study on the tablet grid', () => {
  it('quality types the AIAG study into the grid, sees both methods with their bands, records it and signs the approval; the gauge is flagged', async () => {
    const gauge = await boreGauge('Dial bore gauge for the study grid (browser test)');
    const q = demo('quality');
    const context = await touchContext();
    const page = await context.newPage();
    await signIn(page, served.base, q.email, q.password);
    await page.goto(`${served.base}/gauges/${gauge}`);
    await page.getByRole('link', { name: 'Gauge studies' }).click();
    await page.getByRole('heading', { level: 1, name: new RegExp(`Gauge studies ${gauge}`) }).waitFor();

    const entry = page.getByRole('form', { name: 'Enter a gauge study' });
    await entry.getByLabel('What was measured').fill('Reference parts, AIAG example');
    await entry.getByLabel(/Tolerance band/).fill('6');
    // the grid opens at the usual 3 appraisers × 10 parts × 3 trials; every target a finger's size
    await expect(smallTargets(page, 'form[aria-label="Enter a gauge study"] table')).resolves.toBe(0);
    const first = entry.getByRole('textbox', { name: 'Appraiser A, part 1, trial 1' });
    const box = (await first.boundingBox())!;
    expect(box.height).toBeGreaterThanOrEqual(48);
    // typed as the study runs: down each trial's column, Enter moving to the next part
    await first.click();
    for (let a = 0; a < 3; a++) {
      for (let t = 0; t < 3; t++) {
        for (let p = 0; p < 10; p++) {
          await page.keyboard.type(String(AIAG_READINGS[a]![p]![t]));
          await page.keyboard.press('Enter');
        }
      }
    }
    await expect(entry.getByRole('textbox', { name: 'Appraiser C, part 10, trial 3' }).inputValue()).resolves.toBe(
      '-2.16',
    );

    // AIAG MSA 4th ed. example: by average and range GRR σ 0.30575, %GRR of tolerance 30.6 % (6σ / 6.0),
    // %GRR of TV 26.7 %, ndc 5 (tests/unit/gauge-rr-range.test.ts); by ANOVA %GRR of TV 27.9 %, ndc 4
    const byRange = entry.getByRole('region', { name: 'Average and range figures' });
    // GRR σ at full precision is 0.30577; the manual's 0.30575 multiplies rounded intermediates (as the unit test notes)
    await byRange.getByText('0.30577').waitFor();
    await expect(byRange.getByText('30.6 %').count()).resolves.toBeGreaterThan(0);
    await expect(byRange.getByText('26.7 %').count()).resolves.toBeGreaterThan(0);
    await expect(byRange.getByText('Not acceptable').count()).resolves.toBeGreaterThan(0);
    const byAnova = entry.getByRole('region', { name: 'ANOVA figures' });
    await expect(byAnova.getByText('27.9 %').count()).resolves.toBeGreaterThan(0);
    await expect(byAnova.getByText('Under 5').count()).resolves.toBe(1);
    await page.evaluate(() => window.scrollTo(0, 0)); // sticky table headers draw where the window was
    await page.screenshot({ path: path.join(shots, 'gauge-study-grid-1024-touch.png'), fullPage: true });

    // the grid and both methods' figures: no serious or critical accessibility problem, target size included
    const axe = await new AxeBuilder({ page }).options({ rules: { 'target-size': { enabled: true } } }).analyze();
    const serious = axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
    expect(serious.map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(' ')).join(', ')}`)).toEqual([]);

    await entry.getByLabel('Method on record').selectOption('range');
    await entry.getByRole('button', { name: 'Record the study' }).click();
    const detail = page.getByRole('region', { name: /Study \d+: Gauge R&R, average and range/ });
    await detail.waitFor();
    await expect(detail.getByText('By ANOVA, for comparison', { exact: true }).count()).resolves.toBe(1);
    await expect(page.getByText('Last study failed').count()).resolves.toBe(1);

    // approval: signer, meaning, reason and time
    const approve = detail.getByRole('form', { name: 'Approve the study' });
    await approve.getByLabel('Reason').fill('Reviewed with the three appraisers');
    await approve.getByLabel('Password (your signature)').fill(q.password);
    await approve.getByRole('button', { name: 'Sign and approve' }).click();
    await detail.getByText(new RegExp(`Signed by ${q.name} on .* UTC — Approved the average-and-range`)).waitFor();
    await expect(smallTargets(page, 'main')).resolves.toBe(0);
    await page.evaluate(() => window.scrollTo(0, 0));
    await page.screenshot({ path: path.join(shots, 'gauge-study-approved-1024-touch.png'), fullPage: true });

    // the grid is empty again; a block copied from a spreadsheet fills right across the trials and
    // appraisers and down the parts from the cell it is pasted into
    const target = entry.getByRole('textbox', { name: 'Appraiser A, part 2, trial 3' });
    await expect(target.inputValue()).resolves.toBe('');
    await target.evaluate((el) => {
      const data = new DataTransfer();
      data.setData('text/plain', '1.01\t1.02\t1.03\n2.01\t2.02\t2.03\n');
      el.dispatchEvent(new ClipboardEvent('paste', { clipboardData: data, bubbles: true, cancelable: true }));
    });
    const cell = (a: string, p: number, t: number) =>
      entry.getByRole('textbox', { name: `Appraiser ${a}, part ${p}, trial ${t}` }).inputValue();
    await expect(cell('A', 2, 3)).resolves.toBe('1.01');
    await expect(cell('B', 2, 1)).resolves.toBe('1.02');
    await expect(cell('B', 3, 2)).resolves.toBe('2.03');
    await expect(cell('A', 1, 3)).resolves.toBe('');
    // what falls outside the grid is said, not silently dropped
    await entry.getByRole('textbox', { name: 'Appraiser C, part 10, trial 3' }).evaluate((el) => {
      const data = new DataTransfer();
      data.setData('text/plain', '3.01\t3.02\n');
      el.dispatchEvent(new ClipboardEvent('paste', { clipboardData: data, bubbles: true, cancelable: true }));
    });
    await expect(cell('C', 10, 3)).resolves.toBe('3.01');
    await entry.getByText('1 pasted value fell outside the grid and was left out').waitFor();

    // an attribute agreement study of a pass/fail check: tap once for pass, again for fail
    await entry.getByLabel('Kind of study').selectOption('attribute');
    await entry.getByLabel('What was measured').fill('Crack test, block deck');
    await entry.getByLabel('Appraisers', { exact: true }).selectOption('2');
    await entry.getByLabel('Parts', { exact: true }).selectOption('6');
    await entry.getByLabel('Trials', { exact: true }).selectOption('2');
    const reference = ['pass', 'pass', 'pass', 'fail', 'fail', 'fail'];
    const tap = async (name: string, to: 'pass' | 'fail') => {
      const cell = entry.getByRole('button', { name: new RegExp(`^${name}:`) });
      await cell.click();
      if (to === 'fail') await cell.click();
      await expect(cell.getAttribute('aria-label')).resolves.toBe(`${name}: ${to}`);
    };
    for (const [p, r] of reference.entries()) {
      await tap(`Reference, part ${p + 1}`, r as 'pass' | 'fail');
      for (const a of ['A', 'B']) {
        for (const t of [1, 2]) {
          // appraiser B calls good part 3 bad on its second trial; every other judgement matches
          const call = a === 'B' && p === 2 && t === 2 ? 'fail' : r;
          await tap(`Appraiser ${a}, part ${p + 1}, trial ${t}`, call as 'pass' | 'fail');
        }
      }
    }
    await expect(smallTargets(page, 'form[aria-label="Enter a gauge study"] table')).resolves.toBe(0);
    const agreement = entry.getByRole('region', { name: 'Attribute agreement figures' });
    const line = (figure: string) =>
      agreement
        .getByRole('table', { name: 'Each appraiser' })
        .getByRole('row')
        .filter({ hasText: figure })
        .textContent();
    // counted from the data: A agrees with itself and the reference on 6 of 6 parts; B on 5 of 6,
    // with 1 false alarm in the 6 judgements of good parts it made (16.7 %, over the 10 % band)
    await expect(line('Agrees with self')).resolves.toMatch(/6\/6 \(100\.0 %\).*5\/6 \(83\.3 %\)/);
    await expect(line('False alarms')).resolves.toMatch(/0\/6 \(0\.0 %\).*1\/6 \(16\.7 %\)/);
    const axeAttr = await new AxeBuilder({ page }).options({ rules: { 'target-size': { enabled: true } } }).analyze();
    expect(
      axeAttr.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => v.id),
    ).toEqual([]);
    // nothing runs off the side of a tablet's screen
    await expect(page.evaluate(() => document.documentElement.scrollWidth)).resolves.toBeLessThanOrEqual(1024);
    await page.evaluate(() => window.scrollTo(0, 0));
    await page.screenshot({ path: path.join(shots, 'gauge-study-attribute-1024-touch.png'), fullPage: true });
    await entry.getByRole('button', { name: 'Record the study' }).click();
    await page.getByRole('region', { name: /Study \d+: Attribute agreement/ }).waitFor();

    await page.setViewportSize({ width: 1440, height: 900 });
    await page.evaluate(() => window.scrollTo(0, 0));
    await page.screenshot({ path: path.join(shots, 'gauge-study-approved-1440.png'), fullPage: true });
    await context.close();

    // the office register flags the gauge too
    const office = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    const desk = await office.newPage();
    await signIn(desk, served.base, q.email, q.password);
    await desk.goto(`${served.base}/gauges/${gauge}`);
    await desk
      .getByRole('heading', { level: 1, name: new RegExp(gauge) })
      .getByText('Last study failed')
      .waitFor();
    await office.close();
  }, 180_000);
});
