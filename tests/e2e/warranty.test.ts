import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it, onTestFailed } from 'vitest';
import { DEMO_USERS } from '../../db/seeders/plant.js';
import { readMailSink, startMailSink } from '../../server/mail/sink.js';
import { Item, Shipment, WarrantyClaim } from '../../server/models/index.js';
import type { CauseCodeJson, ClaimJson } from '../../shared/schemas/warranty.js';
import { signInCookie, type TestApp } from '../support/app.js';
import { deliverMailSince, launch, newestMailId, serveApp, signIn, type Served } from '../support/browser.js';
import { plantToday, tornDownCore } from '../support/parts.js';
import { claimPeople, shippedUnits } from '../support/warranty.js';

/**
 * Issue 20's acceptance, walked as its users would: the warranty desk logs a claim on the demo's
 * shipped unit and sees its coverage at once; receiving takes the unit back; an operator records
 * the teardown; the claim page shows the finding beside the part's readings when it was built;
 * quality opens a corrective action from the claim and an NCR and takes it to a signed closure;
 * the desk decides and closes the claim; each step's mail reaches the loopback sink. Then the
 * analysis and the Weibull screen on the demo's year of shipped units.
 */

let served: Served;
let t: TestApp;
let browser: Browser;
let sink: Awaited<ReturnType<typeof startMailSink>>;
let firstMail: string;
const shots = path.resolve('test-results/e2e');
const demo = (role: string) => DEMO_USERS.find((u) => u.role === role)!;

beforeAll(async () => {
  served = await serveApp();
  t = served.t;
  browser = await launch();
  fs.mkdirSync(shots, { recursive: true });
  sink = await startMailSink({ port: 0, dir: fs.mkdtempSync(path.join(os.tmpdir(), 'coretrail-e2e-sink-')) });
  firstMail = await newestMailId(t.sequelize);
});
afterAll(async () => {
  await sink?.close();
  await browser?.close();
  await served?.close();
});

async function page(role: string, width: number, height: number): Promise<Page> {
  const context = await browser.newContext({ viewport: { width, height } });
  const p = await context.newPage();
  await signIn(p, served.base, demo(role).email, demo(role).password);
  return p;
}

const shot = (p: Page, name: string) => p.screenshot({ path: path.join(shots, `${name}.png`), fullPage: true });

/** Every open page as it stood when a step failed, to see why. */
async function failureShots() {
  let i = 0;
  for (const c of browser.contexts()) {
    for (const p of c.pages())
      await p.screenshot({ path: path.join(shots, `warranty-failed-${++i}.png`), fullPage: true });
  }
}

/** Signs in the dialog a "Sign …" button opens: the dialog says who signs and what it means first. */
async function sign(p: Page, label: string, password: string, screenshot?: string) {
  await p.getByRole('button', { name: `${label}…` }).click();
  const dialog = p.getByRole('dialog', { name: label });
  await dialog.getByText('What you are signing').waitFor();
  if (screenshot) await shot(p, screenshot);
  await dialog.getByLabel('Password', { exact: true }).fill(password);
  await dialog.getByRole('button', { name: label, exact: true }).click();
}

/**
 * The demo's own shipped unit (the first long block the demo seed shipped; its year of history is
 * made of copies marked demoHistory). When an earlier run on a kept database has already claimed
 * it, a fresh unit is built and shipped the same way instead, so the walk can always be made.
 */
async function demoShippedUnit(): Promise<string> {
  const [first] = await t.sequelize.query<{ serial: string; status: string; open: number }>(
    `SELECT u.serial, u.status,
            (SELECT count(*) FROM warranty_claims c WHERE c.unit_item_id = u.id)::int AS open
       FROM items u JOIN shipments s ON s.unit_item_id = u.id
      WHERE u.kind = 'long_block' AND NOT (u.attributes ? 'demoHistory')
      ORDER BY s.id LIMIT 1`,
    { type: QueryTypes.SELECT },
  );
  if (first && first.status === 'shipped' && first.open === 0) return first.serial;
  const [copy] = await shippedUnits(t, await claimPeople(t), 1);
  return copy!.unit;
}

describe('a warranty claim from the field back to the core, and the corrective action it starts', () => {
  it('the desk logs it, receiving takes the unit back, the floor tears it down, quality acts, the desk decides; mail goes at each step', async () => {
    onTestFailed(failureShots);
    const unit = await demoShippedUnit();
    const today = plantToday();
    const shipment = (await Shipment.findOne({
      where: { unitItemId: (await Item.findOne({ where: { serial: unit } }))!.id, returnedAt: null },
    }))!;

    // — the warranty desk: a claim by serial, coverage at once, signed in a dialog —
    const desk = await page('warranty', 1440, 900);
    await desk.goto(`${served.base}/warranty/claims`);
    await desk.getByRole('link', { name: 'Log a claim' }).click();
    await desk.getByRole('heading', { level: 1, name: 'Log a claim' }).waitFor();
    await desk.getByLabel('Unit serial').fill(unit);
    await desk.getByLabel('Distance run (km)').fill('18500');
    const cover = desk.getByRole('status', { name: 'Coverage' });
    await cover.getByText('Covered', { exact: true }).waitFor();
    // the customer the unit shipped to is filled in from the shipment
    await expect
      .poll(() => desk.getByLabel('Customer', { exact: true }).inputValue())
      .toBe(String(shipment.customerId));
    await desk.getByLabel('What the customer reports').fill('Knock from the bottom end once warm, oil light at idle');
    await desk.getByLabel('Installed by').fill('Harrow Lane Motors');
    await shot(desk, 'warranty-log-claim-1440');
    // a wrong password is refused in the dialog and nothing is logged
    await sign(desk, 'Sign and log the claim', 'not my password', 'warranty-sign-dialog-1440');
    await desk.getByRole('dialog').getByText('That is not your password.').waitFor();
    expect(await WarrantyClaim.count({ where: { unitItemId: shipment.unitItemId } })).toBe(0);
    await desk.getByRole('dialog').getByLabel('Password', { exact: true }).fill(demo('warranty').password);
    await desk.getByRole('dialog').getByRole('button', { name: 'Sign and log the claim', exact: true }).click();
    await desk.getByText(/^Claim WC-\d{4}-\d{5,} logged$/).waitFor();
    const number = decodeURIComponent(desk.url().split('/').pop()!);
    expect(number).toMatch(/^WC-\d{4}-\d{5,}$/);
    await desk.getByRole('heading', { name: 'Coverage when logged' }).waitFor();

    // — receiving, on a tablet: the unit back from its home —
    const dock = await page('receiving', 1024, 768);
    await dock.getByRole('heading', { name: /^Units to take back/ }).waitFor();
    await dock.getByRole('link', { name: new RegExp(number) }).click();
    await dock.getByLabel('How it arrived').fill('Crated, drained, seals intact');
    await shot(dock, 'warranty-return-1024');
    await sign(dock, 'Sign and take the unit back', demo('receiving').password);
    await dock.getByText('Waiting for:').waitFor();
    await dock.getByText('Back from the field').first().waitFor();
    expect((await Item.findOne({ where: { serial: unit } }))!.status).toBe('returned');

    // — an operator on the floor records the teardown, against a part and with a measurement —
    const operatorCookie = await signInCookie(t, demo('operator').email, demo('operator').password);
    const before = (await request(t.app).get(`/api/warranty/claims/${number}`).set('Cookie', operatorCookie))
      .body as ClaimJson;
    const block = before.parts.find((p) => p.kind === 'block')!;
    const char = block.characteristics.find((c) => c.unit !== null && c.positions[0]!.code !== '')!;
    const position = char.positions[0]!;
    // what was read on that bore when the block was built (its current result), and a worn reading now
    const [reading] = await t.sequelize.query<{ value: number }>(
      `SELECT rd.value FROM readings rd JOIN stage_results r ON r.id = rd.stage_result_id
         JOIN items i ON i.id = r.item_id JOIN characteristics c ON c.id = rd.characteristic_id
        WHERE i.serial = :serial AND c.code = :code AND rd.position = :position AND rd.value IS NOT NULL
          AND NOT EXISTS (SELECT 1 FROM stage_results x WHERE x.supersedes_id = r.id)
        ORDER BY r.finished_at DESC LIMIT 1`,
      { type: QueryTypes.SELECT, replacements: { serial: block.serial, code: char.code, position: position.code } },
    );
    const builtValue = reading!.value;
    // a bore worn by three parts in ten thousand since it was built
    const worn = Number((builtValue * 1.0003).toFixed(4));
    // the demo's own cause for a worn bore, one the plant counts as a failure of the product
    const causes = (await request(t.app).get('/api/warranty/cause-codes').set('Cookie', operatorCookie))
      .body as CauseCodeJson[];
    const cause = (causes.find((c) => c.code === 'BORE' && c.active) ??
      causes.find((c) => c.active && c.countsAsFailure))!.code;
    const op = await page('operator', 1024, 768);
    await op.getByRole('heading', { name: /^Returned units to tear down/ }).waitFor();
    await op.getByRole('link', { name: new RegExp(number) }).click();
    await op.getByText('Tearing down a returned engine').waitFor();
    await op.getByLabel('Concerns').selectOption(`part:${block.serial}`);
    await op.getByLabel('Cause', { exact: true }).selectOption(cause);
    await op.getByLabel('What was found').fill('Cylinder 3 scuffed on the thrust side, ring lands intact');
    await op.getByRole('button', { name: 'Add a measurement' }).click();
    await op.getByLabel('Characteristic').selectOption(char.code);
    await op.getByLabel('Position').selectOption(position.code);
    await op.getByLabel(/^Value/).fill(String(worn));
    // a value typed in clears the note that the row's other fields left on it
    await expect.poll(() => op.getByText('Enter the value measured.').count()).toBe(0);
    await shot(op, 'warranty-teardown-1024');
    await sign(op, 'Sign the teardown', demo('operator').password);
    await op.getByRole('heading', { name: 'Teardown findings beside the build records' }).waitFor();
    // the claim page puts the finding beside what was measured on that part when it was built: the
    // row of that bore shows the reading at the build and the one at teardown side by side
    const finding = op.getByRole('region', { name: 'Finding 1: when it was built' });
    const rows = finding
      .getByRole('row')
      .filter({ hasText: char.name })
      .filter({ has: op.getByRole('cell', { name: position.label, exact: true }) });
    await rows.first().waitFor();
    const seen = await Promise.all(
      (await rows.all()).map(async (r) =>
        (await r.getByRole('cell').allInnerTexts()).map((c) => parseFloat(c.replace('−', '-'))),
      ),
    );
    // columns: characteristic, position, built, at teardown, limits, rule, gauge
    expect(seen.some((c) => Math.abs(c[2]! - builtValue) < 1e-9)).toBe(true);
    for (const c of seen) expect(c[3]).toBeCloseTo(worn, 4);
    await shot(op, 'warranty-findings-1024');

    // — quality: a corrective action from the claim and an NCR, worked to a signed closure —
    const ncrPart = await tornDownCore(
      t,
      {
        receiving: await signInCookie(t, demo('receiving').email, demo('receiving').password),
        operator: operatorCookie,
      },
      'CORRIE-8',
    );
    const ncr = await request(t.app).post('/api/ncrs').set('Cookie', operatorCookie).send({
      serial: ncrPart.block,
      description: 'Bore scuffing found at bore inspection on a block honed last week',
      severity: 'major',
      defectCode: 'CRK',
    });
    expect(ncr.status).toBe(201);
    const q = await page('quality', 1440, 900);
    await q.goto(`${served.base}/warranty/claims/${number}`);
    await q.getByRole('region', { name: 'Finding 1: when it was built' }).waitFor();
    await shot(q, 'warranty-claim-1440');
    await q.getByRole('link', { name: 'Open a corrective action' }).click();
    await q.getByRole('heading', { level: 1, name: 'Open a corrective action' }).waitFor();
    expect(await q.getByLabel('Claims', { exact: true }).inputValue()).toBe(number);
    await q.getByLabel('NCRs', { exact: true }).fill(ncr.body.number);
    await q.getByLabel('The problem in a line').fill('Bore scuffing on CORRIE-8 blocks after honing');
    await q.getByLabel('Problem statement').fill('One unit back from the field and one block on the line scuffed.');
    await q.getByRole('checkbox', { name: new RegExp(demo('operator').name) }).check();
    await q.getByRole('checkbox', { name: new RegExp(demo('quality').name) }).check();
    await q.getByRole('button', { name: 'Open the corrective action' }).click();
    await q.getByRole('heading', { name: 'Where it came from' }).waitFor();
    const ca = decodeURIComponent(q.url().split('/').pop()!);
    expect(ca).toMatch(/^CA-\d{4}-\d{5,}$/);
    const sources = q.getByRole('region', { name: 'Where it came from' });
    await sources.getByRole('link', { name: number }).waitFor();
    await sources.getByRole('link', { name: ncr.body.number }).waitFor();

    await q.getByRole('button', { name: 'Write the containment' }).click();
    await q.getByRole('textbox', { name: 'Containment' }).fill('Honed blocks in stock held; the line bores checked.');
    await q.getByRole('button', { name: 'Save' }).click();
    await q.getByText('Honed blocks in stock held; the line bores checked.').waitFor();
    await q.getByRole('button', { name: 'Write the root cause' }).click();
    await q.getByRole('textbox', { name: 'Root cause' }).fill('Worn honing stones left the cross-hatch too shallow.');
    await q.getByRole('button', { name: 'Save' }).click();
    await q.getByText('Worn honing stones left the cross-hatch too shallow.').waitFor();

    const addAction = async (kind: string, what: string, owner: string) => {
      await q.getByRole('radio', { name: kind }).check();
      await q.getByLabel('What is to be done').fill(what);
      await q.getByLabel('Owner').selectOption({ label: owner });
      await q.getByLabel('Due on').fill(today);
      await q.getByRole('button', { name: 'Add the action' }).click();
      await q.getByRole('cell', { name: what, exact: true }).waitFor();
    };
    await addAction(
      'Corrective (removes the cause)',
      'Replace the honing stones every 40 bores',
      demo('operator').name,
    );
    await addAction(
      'Preventive (stops it elsewhere)',
      'Add stone wear to the bore-and-hone checks',
      demo('quality').name,
    );
    // the owner on the floor sees the action on their home and marks it done
    await op.goto(`${served.base}/`);
    await op.getByRole('heading', { name: /^Your corrective-action actions/ }).waitFor();
    await shot(op, 'warranty-home-actions-1024');
    await op.getByRole('link', { name: new RegExp(ca) }).click();
    await op.getByRole('button', { name: 'Mark done: Replace the honing stones every 40 bores' }).click();
    await op.getByLabel('What was done').fill('Stone change logged on the hone, every 40 bores');
    await op.getByRole('button', { name: 'Mark done', exact: true }).click();
    await op.getByText(/Done: Stone change logged/).waitFor();
    await q.reload();
    await q.getByRole('button', { name: 'Mark done: Add stone wear to the bore-and-hone checks' }).click();
    await q.getByLabel('What was done').fill('Added to the hone check sheet');
    await q.getByRole('button', { name: 'Mark done', exact: true }).click();
    await q.getByText(/Done: Added to the hone check sheet/).waitFor();

    await q.getByLabel('Check effectiveness on').fill(today);
    await q.getByRole('button', { name: 'Set the day' }).click();
    await q.getByRole('radio', { name: 'Yes: the problem has not come back' }).check();
    await q.getByLabel('What the check found').fill('No scuffing at bore inspection since; no new claims');
    await q.getByRole('button', { name: 'Record the check' }).click();
    await q.getByText('Every action is done and the check found them effective.').waitFor();
    await q.getByLabel('Why it can close').fill('Cause removed and checked effective');
    await sign(q, 'Sign and close', demo('quality').password, 'warranty-ca-sign-1440');
    await q.getByRole('region', { name: 'Closure' }).getByText('Closed', { exact: true }).waitFor();
    await shot(q, 'warranty-ca-closed-1440');
    await q.goto(`${served.base}/corrective-actions?state=all`);
    await q.getByRole('link', { name: ca }).waitFor();
    await shot(q, 'warranty-ca-list-1440');
    await q.goto(`${served.base}/corrective-actions/${ca}`);
    await q.getByRole('region', { name: 'Closure' }).waitFor();
    await q.setViewportSize({ width: 1024, height: 768 });
    await shot(q, 'warranty-ca-closed-1024');

    // — the desk decides and closes the claim —
    await desk.goto(`${served.base}/warranty/claims/${number}`);
    await desk.getByRole('radio', { name: 'Accepted under warranty' }).check();
    await desk.getByLabel('Reason').fill('Bore scuffing from our honing: covered under the terms');
    await sign(desk, 'Sign the decision', demo('warranty').password);
    await desk.getByLabel('Closing note').fill('Replacement engine sent');
    await sign(desk, 'Sign and close the claim', demo('warranty').password);
    await desk.getByText('Closed. Nothing more is done on this claim.').waitFor();
    await desk.getByRole('region', { name: 'Corrective actions' }).getByRole('link', { name: ca }).waitFor();
    await shot(desk, 'warranty-claim-closed-1440');
    await desk.setViewportSize({ width: 1024, height: 768 });
    await shot(desk, 'warranty-claim-closed-1024');

    // — each step's mail, as the loopback sink received it —
    const customer = (
      await t.sequelize.query<{ email: string }>('SELECT email FROM customers WHERE id = :id', {
        type: QueryTypes.SELECT,
        replacements: { id: shipment.customerId },
      })
    )[0]!.email;
    // what was queued since this file began for the demo people and the customer: the other
    // suites share the outbox, and each of their steps mails everyone in a role
    await deliverMailSince(t.sequelize, sink.port, firstMail, [...DEMO_USERS.map((u) => u.email), customer]);
    const got = readMailSink(sink.dir, Number.MAX_SAFE_INTEGER);
    const to = (addr: string, subject: string) => got.filter((m) => m.to.includes(addr) && m.subject === subject);
    expect(to(demo('receiving').email, `Claim ${number}: ${unit} is coming back`)).toHaveLength(1);
    expect(
      to(demo('warranty').email, `Claim ${number}: ${unit} is back at the plant, ready for teardown`),
    ).toHaveLength(1);
    expect(to(demo('quality').email, `Claim ${number}: teardown of ${unit} recorded (1 finding)`)).toHaveLength(1);
    expect(to(demo('operator').email, `Corrective action ${ca}: you are on the team`)).toHaveLength(1);
    expect(to(demo('operator').email, `${ca}: an action for you, due ${today}`)).toHaveLength(1);
    expect(to(demo('operator').email, `Corrective action ${ca} closed`)).toHaveLength(1);
    expect(to(customer, `Your warranty claim ${number} on engine ${unit}: accepted under warranty`)).toHaveLength(1);
    expect(to(demo('quality').email, `Claim ${number} on ${unit} decided: accepted under warranty`)).toHaveLength(1);
    expect(to(customer, `Your warranty claim ${number} on engine ${unit} is closed`)).toHaveLength(1);
  }, 240_000);

  it('the analysis and the Weibull screen show the demo year on first start, at both sizes', async () => {
    for (const [w, h] of [
      [1440, 900],
      [1024, 768],
    ] as const) {
      const q = await page('quality', w, h);
      await q.goto(`${served.base}/warranty/analysis`);
      await q.getByRole('heading', { level: 1, name: 'Warranty analysis' }).waitFor();
      const fleet = q.getByRole('region', { name: /^The fleet/ });
      const claims = Number(
        (await fleet.getByText('Claims', { exact: true }).locator('xpath=..').locator('dd').innerText()).replace(
          /\D/g,
          '',
        ),
      );
      expect(claims).toBeGreaterThan(0);
      await q.getByRole('button', { name: 'Purchased lot' }).click();
      await q.getByRole('region', { name: 'Claim rates by purchased lot' }).getByRole('row').nth(1).waitFor();
      await q.getByRole('region', { name: 'Months in service at failure' }).locator('canvas').first().waitFor();
      await shot(q, `warranty-analysis-${w}`);
      await q.getByRole('link', { name: 'Weibull of time to failure' }).click();
      await q.getByRole('heading', { level: 1, name: 'Weibull of time to failure' }).waitFor();
      await q.getByRole('region', { name: 'Probability plot' }).locator('canvas').first().waitFor();
      const params = q.getByRole('table', { name: 'Weibull parameters by method' });
      for (const method of ['Median-rank regression', 'Maximum likelihood']) {
        const cells = await params.getByRole('row').filter({ hasText: method }).getByRole('cell').allInnerTexts();
        // shape, scale and B10 are numbers, not dashes
        expect(Number(cells[1])).toBeGreaterThan(0);
        expect(cells[2]).toMatch(/^\d+\.\d months$/);
        expect(cells[3]).toMatch(/^\d+\.\d months$/);
      }
      await shot(q, `warranty-weibull-${w}`);
      await q.context().close();
    }
  }, 120_000);
});
