import fs from 'node:fs';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import axe from 'axe-core';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_USERS } from '../../db/seeders/plant.js';
import { can, type Permission } from '../../shared/permissions.js';
import { ROLES, type Role } from '../../shared/roles.js';
import {
  Customer,
  EngineFamily,
  Gauge,
  PartLot,
  ToleranceRule,
  User,
  WarrantyClaim,
} from '../../server/models/index.js';
import { cookieFor, makeUser, TEST_PASSWORD } from '../support/app.js';
import { givenSecondFactor, launch, serveApp, type Served } from '../support/browser.js';
import { plantToday, releasableUnit } from '../support/parts.js';

/**
 * Every screen as every role that may open it, on a 1024×768 touch tablet and a 1440×900 desk with
 * a mouse: axe finds no serious or critical problem (target size included), every control on the
 * tablet is at least 48 px, and at 1440 no table is wider than the box it sits in.
 */

type Viewport = { name: 'touch-1024' | 'mouse-1440'; width: number; height: number; touch: boolean };
const VIEWPORTS: Viewport[] = [
  { name: 'touch-1024', width: 1024, height: 768, touch: true },
  { name: 'mouse-1440', width: 1440, height: 900, touch: false },
];

// the smallest target on a touch screen: the 48 px (WCAG 2.5.8 asks 24 px, 2.5.5 44 px)
const TOUCH_TARGET_PX = 48;
const shots = path.resolve('test-results/e2e/office');

let served: Served;
let browser: Browser;
let unit: string;
let crankshaft: string;
let core: string;
let ncr: string;
let lot: string;
let lotId: number;
let fieldAction: string;
let rule: string;
let gauge: string;
let claim: string;
let ca: string;

beforeAll(async () => {
  served = await serveApp();
  browser = await launch();
  fs.mkdirSync(shots, { recursive: true });
  const t = served.t;
  const cookies = {
    receiving: await cookieFor(await makeUser('receiving'), t.config),
    operator: await cookieFor(await makeUser('operator'), t.config),
  };
  // a V8 (48 bore readings a block) built, run-tested, shipped, and then found with a soft journal
  const tag = `O${randomUUID().slice(0, 5).toUpperCase()}`;
  const built = await releasableUnit(t, cookies, 'CORRIE-8', tag);
  unit = built.unit;
  crankshaft = built.parts.crankshaft;
  core = built.parts.core;
  lot = `${tag}-PISTONS`;
  lotId = (await PartLot.findOne({ where: { lotCode: lot } }))!.id;
  const shipping = await cookieFor(await makeUser('shipping'), t.config);
  const customer = (await Customer.findOne({ order: [['id', 'ASC']] }))!;
  const shipped = await request(t.app)
    .post(`/api/units/${unit}/release`)
    .set('Cookie', shipping)
    .send({ customerId: customer.id, reference: `SO-${unit}`, shipDate: plantToday(), password: TEST_PASSWORD });
  expect(shipped.status).toBe(201);
  const raised = await request(t.app).post('/api/ncrs').set('Cookie', cookies.operator).send({
    serial: crankshaft,
    description: 'Soft journal found on a crank of the same grinder batch',
    severity: 'major',
    defectCode: 'OOT',
  });
  expect(raised.status).toBe(201);
  ncr = raised.body.number;
  const warranty = await cookieFor(await makeUser('warranty'), t.config);
  const actions = await request(t.app).get('/api/field-actions').set('Cookie', warranty);
  fieldAction = actions.body.rows.find((r: { ncr: { number: string } }) => r.ncr.number === ncr).number;
  const v8 = (await EngineFamily.findOne({ where: { code: 'CORRIE-8' } }))!;
  const r = (await ToleranceRule.findOne({ where: { engineFamilyId: v8.id }, order: [['version', 'DESC']] }))!;
  rule = `/spec/CORRIE-8/${r.characteristicId}`;
  await givenSecondFactor(DEMO_USERS.find((u) => u.role === 'admin')!.email, t.config);
  // a gauge and a claim of the demo plant's; a corrective action opened on this file's NCR
  gauge = (await Gauge.findOne({ order: [['id', 'ASC']] }))!.code;
  claim = (await WarrantyClaim.findOne({ order: [['id', 'ASC']] }))!.number;
  const opened = await request(t.app)
    .post('/api/corrective-actions')
    .set('Cookie', await cookieFor(await makeUser('quality'), t.config))
    .send({ title: `Soft journals ${tag}`, problem: 'Journals found soft after grinding', ncrs: [ncr] });
  expect(opened.status).toBe(201);
  ca = opened.body.number;
}, 180_000);
afterAll(async () => {
  await browser?.close();
  await served?.close();
});

/** Each screen and what opens it (null: anyone signed in). */
const routes = (): { name: string; path: string; permission: Permission | null }[] => [
  { name: 'home', path: '/', permission: null },
  { name: 'account', path: '/account', permission: null },
  { name: 'people', path: '/admin/people', permission: 'people.manage' },
  { name: 'stations', path: '/admin/stations', permission: 'stations.manage' },
  { name: 'families', path: '/admin/families', permission: 'families.manage' },
  { name: 'process', path: '/admin/process', permission: 'process.edit' },
  { name: 'routes', path: '/admin/routes', permission: 'process.edit' },
  { name: 'process-document', path: '/admin/process/document', permission: 'process.edit' },
  { name: 'plant', path: '/admin/plant', permission: 'plant.manage' },
  { name: 'defect-codes', path: '/admin/defect-codes', permission: 'defects.manage' },
  { name: 'mail', path: '/admin/mail', permission: 'mail.read' },
  { name: 'audit', path: '/admin/audit', permission: 'audit.read' },
  { name: 'intake', path: '/intake', permission: 'intake.read' },
  { name: 'receive', path: '/intake/new', permission: 'intake.record' },
  { name: 'core', path: `/cores/${core}`, permission: 'intake.read' },
  { name: 'item', path: `/items/${crankshaft}`, permission: 'items.read' },
  { name: 'teardown', path: '/teardown', permission: 'teardown.record' },
  { name: 'labels', path: `/labels?serials=${crankshaft}`, permission: 'labels.print' },
  { name: 'station', path: '/station', permission: 'station.form' },
  { name: 'spec', path: '/spec?family=CORRIE-8', permission: 'spec.read' },
  { name: 'rule', path: rule, permission: 'spec.read' },
  { name: 'spc', path: '/spc', permission: 'spc.read' },
  { name: 'ncrs', path: '/ncrs', permission: 'ncr.read' },
  { name: 'ncr', path: `/ncrs/${ncr}`, permission: 'ncr.read' },
  { name: 'raise-concern', path: '/ncrs/new', permission: 'ncr.raise' },
  { name: 'build', path: '/build', permission: 'assembly.record' },
  { name: 'release', path: `/release?serial=${unit}`, permission: 'release.check' },
  { name: 'trail', path: `/trail?serial=${unit}`, permission: 'trail.read' },
  { name: 'lot', path: `/lots/${lot}`, permission: 'trail.read' },
  { name: 'received-lots', path: '/receiving/lots', permission: 'lots.read' },
  { name: 'receive-lot', path: '/receiving/lots/new', permission: 'lots.receive' },
  { name: 'received-lot', path: `/receiving/lots/${lotId}`, permission: 'lots.read' },
  { name: 'field-actions', path: '/field-actions', permission: 'field-actions.read' },
  { name: 'field-action', path: `/field-actions/${fieldAction}`, permission: 'field-actions.read' },
  { name: 'gauges', path: '/gauges', permission: 'gauges.read' },
  { name: 'gauge', path: `/gauges/${gauge}`, permission: 'gauges.read' },
  { name: 'gauge-studies', path: `/gauges/${gauge}/studies`, permission: 'gauges.read' },
  { name: 'blast-radius', path: `/blast-radius?gauge=${gauge}`, permission: 'containment.read' },
  { name: 'wip', path: '/wip', permission: 'wip.read' },
  { name: 'yields', path: '/yields', permission: 'yields.read' },
  { name: 'search', path: `/search?q=${unit.slice(0, 6)}`, permission: null },
  { name: 'claims', path: '/warranty/claims', permission: 'warranty.read' },
  { name: 'log-claim', path: '/warranty/claims/new', permission: 'warranty.record' },
  { name: 'claim', path: `/warranty/claims/${claim}`, permission: 'warranty.read' },
  { name: 'warranty-analysis', path: '/warranty/analysis', permission: 'warranty.analysis' },
  { name: 'weibull', path: '/warranty/weibull', permission: 'warranty.analysis' },
  { name: 'cause-codes', path: '/admin/cause-codes', permission: 'cause-codes.manage' },
  { name: 'corrective-actions', path: '/corrective-actions', permission: 'corrective-actions.read' },
  { name: 'open-ca', path: '/corrective-actions/new', permission: 'corrective-actions.manage' },
  { name: 'ca', path: `/corrective-actions/${ca}`, permission: 'corrective-actions.read' },
];

async function contextFor(role: Role, vp: Viewport): Promise<BrowserContext> {
  const demo = DEMO_USERS.find((u) => u.role === role)!;
  const user = (await User.findOne({ where: { email: demo.email } }))!;
  const [name, value] = (await cookieFor(user, served.t.config)).split('=') as [string, string];
  const context = await browser.newContext({
    viewport: { width: vp.width, height: vp.height },
    hasTouch: vp.touch,
    isMobile: false,
  });
  await context.addCookies([{ name, value, url: served.base }]);
  return context;
}

/**
 * Opens a screen and waits for its heading, its data (nothing busy) and its fonts. The first screen
 * loads the page; the others are reached inside the app, as a person moving through it would (the
 * history API and a popstate, which the router follows), which spares a reload of the client each.
 */
async function open(page: Page, url: string) {
  if (!page.url().startsWith(served.base)) await page.goto(`${served.base}${url}`);
  else {
    await page.evaluate((u) => {
      history.pushState(null, '', u);
      dispatchEvent(new PopStateEvent('popstate', { state: null }));
    }, url);
  }
  await page
    .waitForFunction((u) => {
      const want = new URL(u, location.origin);
      const shown = document.querySelector('main')?.getAttribute('data-location') ?? '';
      // a screen opened bare may fill in its own defaults (the SPC chart picks a characteristic)
      return shown === want.pathname + want.search || (!want.search && shown.split('?')[0] === want.pathname);
    }, url)
    .catch(async (err: Error) => {
      const at = await page.evaluate(() => document.querySelector('main')?.getAttribute('data-location'));
      throw new Error(`${url} never showed (the page shows ${at}): ${err.message}`);
    });
  await page.locator('main h1').first().waitFor();
  await page.waitForFunction(() => !document.querySelector('[aria-busy="true"]') && document.fonts.status === 'loaded');
}

/**
 * axe-core run in the page: its script goes in once per page (the screens after the first are
 * reached inside the app, so it stays), which spares the injection a builder makes on every run.
 * Target size is on (axe leaves it off by default); `rules` narrows the run, `include` its scope.
 */
async function runAxe(page: Page, rules?: string[], include?: string) {
  if (!(await page.evaluate(() => 'axe' in window))) await page.evaluate(axe.source);
  return page.evaluate(
    async ({ rules, include }) => {
      const a = (window as unknown as { axe: typeof axe }).axe;
      const result = await a.run(include ? { include: [[include]] } : document, {
        resultTypes: ['violations'],
        rules: { 'target-size': { enabled: true } },
        ...(rules ? { runOnly: { type: 'rule' as const, values: rules } } : {}),
      });
      return result.violations.map((v) => ({
        id: v.id,
        impact: v.impact ?? null,
        targets: v.nodes.slice(0, 3).map((n) => n.target.join(' ')),
      }));
    },
    { rules, include },
  );
}

/** axe-core's rules about controls, names and structure: what differs when another role opens a screen. */
const ROLE_RULES = [
  'target-size',
  'button-name',
  'link-name',
  'label',
  'select-name',
  'input-button-name',
  'nested-interactive',
  'aria-allowed-attr',
  'aria-required-attr',
  'aria-valid-attr-value',
  'aria-prohibited-attr',
  'duplicate-id-aria',
  'list',
  'listitem',
  'definition-list',
  'dlitem',
];

// the screens already opened at each size (name-size), by any role, and the controls each showed
const seen = new Set<string>();
const checkedControls = new Set<string>();

/** The page's controls (kind, name, state), as one string: two roles with the same string see the same controls. */
function controlsOf(page: Page) {
  return page.evaluate(() =>
    // the page's own controls: the header's name and role differ for everyone and say nothing new
    Array.from(
      document.querySelectorAll('main :is(a[href], button, input, select, textarea, summary, [role], [tabindex])'),
    )
      .map(
        (el) =>
          `${el.tagName}:${el.getAttribute('aria-label') ?? el.textContent?.trim().slice(0, 30)}:${(el as HTMLInputElement).disabled}`,
      )
      .join('|'),
  );
}

/** Tables (or their scroll boxes) wider than the box they sit in, and a page that scrolls sideways. */
function tablesTooWide(page: Page) {
  return page.evaluate(() => {
    const out: string[] = [];
    const name = (t: HTMLTableElement) =>
      t.caption?.textContent?.trim() || t.closest('[aria-label]')?.getAttribute('aria-label') || 'a table';
    for (const t of Array.from(document.querySelectorAll('table'))) {
      if (!t.getClientRects().length) continue;
      const parent = t.parentElement!;
      const width = t.getBoundingClientRect().width;
      if (width > parent.clientWidth + 1) out.push(`${name(t)}: ${Math.round(width)} px in ${parent.clientWidth}`);
      // a scroll box around the table that has to scroll sideways
      for (let el: HTMLElement | null = parent; el && el !== document.body; el = el.parentElement) {
        const ox = getComputedStyle(el).overflowX;
        if ((ox === 'auto' || ox === 'scroll') && el.scrollWidth > el.clientWidth + 1) {
          out.push(`${name(t)}: scrolls sideways (${el.scrollWidth} px in ${el.clientWidth})`);
          break;
        }
      }
    }
    const doc = document.documentElement;
    if (doc.scrollWidth > doc.clientWidth + 1) out.push(`the page scrolls sideways (${doc.scrollWidth} px)`);
    return out;
  });
}

/** Controls a finger cannot hit: smaller than the touch target (inline links in text are exempt, as in WCAG). */
function smallTargets(page: Page, min: number) {
  return page.evaluate((min) => {
    const out: string[] = [];
    const sel = 'button, select, textarea, summary, [role="button"], [role="tab"], input:not([type="hidden"]), a[href]';
    for (const el of Array.from(document.querySelectorAll<HTMLElement>(sel))) {
      if (!el.getClientRects().length || el.closest('[aria-hidden="true"], [inert]')) continue;
      const style = getComputedStyle(el);
      if (style.visibility === 'hidden') continue;
      if (el.tagName === 'A' && style.display === 'inline') continue;
      let box = el.getBoundingClientRect();
      const input = el as HTMLInputElement;
      // a checkbox or radio is hit through its label
      if (el.tagName === 'INPUT' && (input.type === 'checkbox' || input.type === 'radio')) {
        const label = input.closest('label') ?? input.labels?.[0];
        if (label) box = label.getBoundingClientRect();
      }
      if (el.tagName === 'INPUT' && input.type === 'file' && style.opacity === '0') continue;
      // nothing to hit: not drawn, or drawn only for a screen reader until it has focus (skip link)
      if (box.width <= 1 || box.height <= 1) continue;
      if (box.height + 0.5 < min || box.width + 0.5 < min) {
        const text = (el.getAttribute('aria-label') || el.textContent || (el as HTMLInputElement).name || el.id || '')
          .trim()
          .replace(/\s+/g, ' ')
          .slice(0, 40);
        out.push(`${el.tagName.toLowerCase()} "${text}" ${Math.round(box.width)}×${Math.round(box.height)}`);
      }
    }
    return [...new Set(out)];
  }, min);
}

describe('every screen fits the device it is opened on', () => {
  for (const vp of VIEWPORTS) {
    for (const role of ROLES.filter(
      (r) => !process.env.OFFICE_SCREENS_ROLES || process.env.OFFICE_SCREENS_ROLES.split(',').includes(r),
    )) {
      it(`when ${role} opens each screen at ${vp.width}×${vp.height} (${vp.touch ? 'touch' : 'mouse'}), then axe finds nothing serious${vp.touch ? ', every control is 48 px' : ''}, no table is wider than its box`, async () => {
        const context = await contextFor(role, vp);
        const page = await context.newPage();
        const problems: string[] = [];
        try {
          for (const r of routes()) {
            if (r.permission && !can(role, r.permission)) continue;
            const began = Date.now();
            await open(page, r.path);
            const opened = Date.now();
            // Every rule (target size included) the first time a screen is opened at 1024 with touch.
            // After that only the rules about controls (ROLE_RULES, target size among them), and only
            // when this role's screen has controls no role before it had here: colours, headings and
            // landmarks are the same for everyone and at both sizes, and axe is the test's cost.
            const key = `${r.name}-${vp.name}`;
            const controls = await controlsOf(page);
            const fresh = !checkedControls.has(`${key}:${controls}`);
            checkedControls.add(`${key}:${controls}`);
            const full = vp.touch && !seen.has(key);
            // a role's own header (its menu) is checked on its home; elsewhere the rules about
            // controls look at the screen's own part, which is what differs from role to role
            const violations = full
              ? await runAxe(page)
              : fresh
                ? await runAxe(page, ROLE_RULES, r.name === 'home' ? undefined : 'main')
                : [];
            for (const v of violations.filter((v) => v.impact === 'serious' || v.impact === 'critical')) {
              problems.push(`${r.name}: axe ${v.id} (${v.impact}) at ${v.targets.join(', ')}`);
            }
            const checked = Date.now();
            if (vp.touch) {
              for (const s of await smallTargets(page, TOUCH_TARGET_PX)) problems.push(`${r.name}: small target ${s}`);
            }
            // a tablet's page does not scroll sideways either
            for (const w of await tablesTooWide(page)) problems.push(`${r.name}: ${w}`);
            // one screenshot of each screen per size (the first role to open it), and every role's home
            if (r.name === 'home' || !seen.has(key)) {
              await page.screenshot({ path: path.join(shots, `${r.name}-${role}-${vp.name}.png`), fullPage: true });
            }
            seen.add(key);
            if (process.env.OFFICE_SCREENS_DEBUG) {
              const mine = problems.filter((p) => p.startsWith(`${r.name}:`)).join('\n');
              const times = `open ${opened - began} axe ${checked - opened} rest ${Date.now() - checked} ms`;
              console.log(`${vp.name} ${role} ${r.name} ${times}\n${mine}`);
            }
          }
        } finally {
          await context.close();
        }
        expect(problems).toEqual([]);
      }, 600_000);
    }
  }
});

describe('the trail and the audit trail read in the page and in words', () => {
  it('when quality expands the last result on a V8’s trail, then its readings are in the page itself, not in a scroll box of their own', async () => {
    const context = await contextFor('quality', VIEWPORTS[1]!);
    const page = await context.newPage();
    try {
      await open(page, `/trail?serial=${unit}`);
      await page
        .getByRole('button', { name: /^Readings \(\d+\)/ })
        .last()
        .click();
      const readings = page.getByRole('table', { name: /^Readings of result/ }).last();
      const lastRow = readings.locator('tbody tr').last();
      await lastRow.scrollIntoViewIfNeeded();
      const boxes = await readings.evaluate((table) => {
        const out: string[] = [];
        for (let el = table.parentElement; el && el !== document.body; el = el.parentElement) {
          const oy = getComputedStyle(el).overflowY;
          if (oy !== 'visible' && oy !== 'clip' && el.scrollHeight > el.clientHeight + 1) {
            out.push(`${el.tagName.toLowerCase()} ${el.getAttribute('aria-label') ?? el.className}`);
          }
        }
        return out;
      });
      expect(boxes).toEqual([]);
      // the last reading is on screen and nothing covers it
      const hit = await lastRow.evaluate((tr) => {
        const b = tr.getBoundingClientRect();
        return tr.contains(document.elementFromPoint(b.left + b.width / 2, b.top + b.height / 2));
      });
      expect(hit).toBe(true);
      await page.screenshot({ path: path.join(shots, 'trail-last-result-open-mouse-1440.png') });
    } finally {
      await context.close();
    }
  }, 60_000);

  it('when an admin filters the audit trail by kind, person and days, then each filter narrows the list and no raw code is shown', async () => {
    const context = await contextFor('admin', VIEWPORTS[1]!);
    const page = await context.newPage();
    try {
      await open(page, '/admin/audit');
      const kinds = await page.getByLabel('Kind of record').locator('option').allTextContents();
      // the missing kinds: NCRs, results, rules (src/routes/admin/audit/words.ts)
      expect(kinds).toEqual(expect.arrayContaining(['NCRs', 'Stage results', 'Spec rules', 'Cores, parts and units']));
      await page.getByLabel('Kind of record').selectOption({ label: 'NCRs' });
      await page
        .getByRole('button', { name: `Only events of NCR ${ncr}` })
        .first()
        .waitFor();
      const events = page.getByRole('table', { name: 'Audit events, newest first' });
      const text = await events.innerText();
      expect(text).toContain('NCR raised');
      // no action code (item.held, ncr.raised) and no table name (stage_result) on screen
      expect(text.match(/\b[a-z]+_?[a-z]*\.[a-z_]+\b|\b[a-z]+_[a-z_]+\b/g)).toBeNull();
      const today = await page.evaluate(() => new Date().toISOString().slice(0, 10));
      const tomorrow = await page.evaluate(() => new Date(Date.now() + 2 * 86_400_000).toISOString().slice(0, 10));
      await page.getByLabel('From', { exact: true }).fill(tomorrow);
      await page.getByText('No events match these filters.').waitFor();
      await page.getByLabel('From', { exact: true }).fill('');
      await page.getByLabel('To', { exact: true }).fill(today);
      await page
        .getByRole('button', { name: `Only events of NCR ${ncr}` })
        .first()
        .waitFor();
      const operator = await page
        .getByLabel('Person')
        .locator('option', { hasText: /Station operator/ })
        .first();
      await page.getByLabel('Person').selectOption({ label: (await operator.textContent())!.trim() });
      await page.waitForURL(/actorId=\d+/);
      await page.screenshot({ path: path.join(shots, 'audit-filtered-mouse-1440.png'), fullPage: true });
    } finally {
      await context.close();
    }
  }, 60_000);
});
