import { chromium, type Page } from 'playwright-core';
import { armProbe, awaitProbe, type ProbeResult } from './client-probe.js';
import { summarize } from './stats.js';

export type ScanOptions = {
  baseUrl: string;
  email: string;
  password: string;
  /** Station code, e.g. BH-1; the operator must be able to choose it on the station screen. */
  station: string;
  /**
   * Parts waiting at that station, in the printed form (BK-CDEH-6VCP); one sample each. The first
   * is also the warm-up scan, so it is measured last.
   */
  serials: string[];
  chromiumPath?: string;
  /** Where to save a screenshot (1024 wide, whole page) of the first measured ready form. */
  screenshot?: string;
  /** Each measured scan with its breakdown, for a caller that wants more than the figures. */
  onSample?: (sample: ScanSample) => void;
};

export type ScanSample = { serial: string } & ProbeResult;

export type ScanStats = { samples: number[]; p50: number; p95: number; max: number; min: number };

const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

const SCAN_TIMEOUT_MS = 15_000;

/**
 * Scan-to-form on the station screen, timed inside the page: from the Enter keydown a hand
 * scanner sends after the serial to the first frame that shows the part's first reading input
 * present and enabled (see client-probe.ts). Every sample starts as a tablet does after "Next
 * part": the station screen open with no part, the scan box empty and focused.
 */
export async function measureScanToForm(opts: ScanOptions): Promise<ScanStats> {
  const first = opts.serials[0];
  if (first === undefined) throw new Error('measureScanToForm needs at least one serial');
  const base = opts.baseUrl.replace(/\/+$/, '');
  const browser = await chromium.launch({
    executablePath: opts.chromiumPath ?? '/usr/bin/chromium',
    args: CHROMIUM_ARGS,
  });
  try {
    const context = await browser.newContext({ viewport: { width: 1024, height: 768 } });
    // tsx compiles with keepNames, which wraps inner functions in __name(); the probe runs in the page
    await context.addInitScript('globalThis.__name ??= (f) => f;');
    const page = await context.newPage();
    const pageErrors: string[] = [];
    page.on('pageerror', (e) => pageErrors.push(e.message));
    try {
      await signIn(page, base, opts.email, opts.password);
      await openStation(page, base, opts.station);
      await scanOnce(page, first); // warm-up: first fetch of the form code paths, not counted
      // a scan asks the server afresh (station-page.tsx), so the warm-up serial can be measured again, last
      const order = [...opts.serials.slice(1), first];
      const samples: number[] = [];
      for (const serial of order) {
        const r = await scanOnce(page, serial);
        if (samples.length === 0 && opts.screenshot) await page.screenshot({ path: opts.screenshot, fullPage: true });
        samples.push(r.paintMs);
        opts.onSample?.({ serial, ...r });
      }
      return { samples, ...summarise(samples) };
    } catch (err) {
      if (pageErrors.length && err instanceof Error) err.message += `\nErrors in the page: ${pageErrors.join(' | ')}`;
      throw err;
    }
  } finally {
    await browser.close();
  }
}

async function signIn(page: Page, base: string, email: string, password: string) {
  await page.goto(`${base}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  try {
    await page.waitForURL((u) => u.pathname !== '/sign-in', { timeout: 10_000 });
  } catch {
    const said = await page.getByRole('alert').allTextContents();
    throw new Error(`sign-in as ${email} failed: ${said.join(' ') || 'still on the sign-in page'}`);
  }
}

/** A fresh browser remembers no station: choose it as an operator does on a new tablet. */
async function openStation(page: Page, base: string, station: string) {
  await page.goto(`${base}/station`);
  // the stations are tiles, one tap chooses (the tile's name starts with its code)
  try {
    await page.getByRole('button', { name: new RegExp(`\\b${station}\\b`) }).click({ timeout: 10_000 });
  } catch {
    throw new Error(`station ${station} is not offered on the station screen (not recording, or unknown)`);
  }
  await page.getByRole('textbox', { name: 'Serial' }).waitFor();
}

async function scanOnce(page: Page, serial: string): Promise<ProbeResult> {
  await emptyScanBox(page);
  await settle(page);
  await page.evaluate(armProbe, { serial, timeoutMs: SCAN_TIMEOUT_MS });
  // a keyboard-wedge scanner types the characters, then presses Enter
  await page.keyboard.type(serial);
  await page.keyboard.press('Enter');
  const result = await page.evaluate(awaitProbe).catch((err: unknown) => {
    // keep the probe's own sentence, without Playwright's prefix and the stack inside the page
    const said = err instanceof Error ? (err.message.split('\n')[0] ?? '') : String(err);
    throw new Error(said.replace(/^page\.evaluate: Error: /, ''), { cause: err });
  });
  return result;
}

/**
 * Back to the state "Next part" leaves: the Station link in the main navigation drops the serial
 * from the address (the part's form goes), and the box is emptied and focused for the scanner.
 */
async function emptyScanBox(page: Page) {
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Station', exact: true }).click();
  await page.waitForURL((u) => u.pathname === '/station' && !u.searchParams.has('serial'));
  await page.locator('form[aria-label*=" readings for "]').waitFor({ state: 'detached' });
  const box = page.getByRole('textbox', { name: 'Serial' });
  await box.fill('');
  await box.focus();
}

/** Let the page finish what the reset started (navigation, renders) before the clock can start. */
async function settle(page: Page) {
  await page.locator('main[aria-busy="true"]').waitFor({ state: 'detached' });
  await page.evaluate(
    () =>
      new Promise<void>((resolve) => {
        requestAnimationFrame(() =>
          requestAnimationFrame(() => requestIdleCallback(() => resolve(), { timeout: 500 })),
        );
      }),
  );
}

function summarise(samples: number[]): Omit<ScanStats, 'samples'> {
  const { p50, p95, max } = summarize(samples);
  return { p50, p95, max, min: Math.min(...samples) };
}
