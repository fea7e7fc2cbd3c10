/**
 * Runs inside the page (page.evaluate), so it may use nothing from the module around it. It is
 * armed before the serial is typed; the clock starts at the Enter keydown (capture phase, before
 * the scan box's own handler) and stops once the form is ready, as `formReady` below defines.
 */
export type ProbeResult = {
  /** Enter → the first reading input is in the DOM, connected, enabled and laid out. */
  domMs: number;
  /** Enter → the first frame showing it has been produced (rAF, then a task queued after it). */
  paintMs: number;
  /** Resources fetched after Enter (API calls, any chunk), times relative to Enter. */
  requests: { url: string; startMs: number; endMs: number }[];
  /** Main-thread tasks over 50 ms after Enter: where the page itself, not the network, spent time. */
  longTasks: { startMs: number; durationMs: number }[];
};

export type ProbeArgs = { serial: string; timeoutMs: number };

export function armProbe({ serial, timeoutMs }: ProbeArgs): void {
  const w = window as unknown as Record<string, Promise<ProbeResult> | undefined>;
  // The reading form is labelled "<stage> readings for <serial>": it must be this part's form. Its
  // first input[data-field] is the first reading box (or the Pass tile of a pass/fail check); the
  // gauge <select> above it is not a reading, and the photo picker comes last.
  let stale: HTMLInputElement | null = null;
  const formReady = (): HTMLInputElement | null => {
    for (const form of document.querySelectorAll<HTMLFormElement>('form[aria-label]')) {
      if (!(form.getAttribute('aria-label') ?? '').endsWith(` readings for ${serial}`)) continue;
      const el = form.querySelector<HTMLInputElement>('input[data-field]:not([type="file"])');
      if (!el || el === stale || !el.isConnected || el.disabled || el.closest('fieldset:disabled, [inert]')) {
        return null;
      }
      // laid out with a box: not display:none, not inside a closed <details> or a hidden parent
      return el.checkVisibility() && el.getClientRects().length > 0 ? el : null;
    }
    return null;
  };
  const alerts = () =>
    [...document.querySelectorAll('[role="alert"]')].map((n) => (n.textContent ?? '').trim()).filter(Boolean);
  // a form for the same serial, or an alert, left over from a previous scan does not count
  stale = formReady();
  const alertsBefore = new Set(alerts());
  performance.clearResourceTimings();
  performance.setResourceTimingBufferSize(1000);

  const long: PerformanceEntry[] = [];
  const longObserver = new PerformanceObserver((list) => long.push(...list.getEntries()));
  longObserver.observe({ type: 'longtask' });

  const pending = new Promise<ProbeResult>((resolve, reject) => {
    let enterAt = -1;
    let done = false;
    let observer: MutationObserver | null = null;
    const finish = () => {
      done = true;
      observer?.disconnect();
      longObserver.disconnect();
      document.removeEventListener('keydown', onKey, true);
      clearTimeout(timer);
    };
    const check = () => {
      if (done || enterAt < 0) return;
      if (!formReady()) {
        // a refusal (unknown serial, wrong part, not due) is final: say it now rather than time out
        const fresh = alerts().filter((t) => !alertsBefore.has(t));
        if (fresh.length) {
          finish();
          reject(new Error(`${serial}: the station screen did not open a form: ${fresh.join(' | ').slice(0, 500)}`));
        }
        return;
      }
      const domAt = performance.now();
      finish();
      requestAnimationFrame(() => {
        const channel = new MessageChannel();
        channel.port1.onmessage = () => {
          const paintAt = performance.now();
          const requests = performance
            .getEntriesByType('resource')
            .filter((e) => e.startTime >= enterAt)
            .map((e) => {
              const u = new URL(e.name);
              const r = e as PerformanceResourceTiming;
              return { url: u.pathname + u.search, startMs: r.startTime - enterAt, endMs: r.responseEnd - enterAt };
            });
          const longTasks = long
            .filter((e) => e.startTime + e.duration >= enterAt)
            .map((e) => ({ startMs: e.startTime - enterAt, durationMs: e.duration }));
          resolve({ domMs: domAt - enterAt, paintMs: paintAt - enterAt, requests, longTasks });
        };
        channel.port2.postMessage(null);
      });
    };
    const poll = () => {
      check();
      if (!done) requestAnimationFrame(poll);
    };
    function onKey(e: KeyboardEvent) {
      if (e.key !== 'Enter' || enterAt >= 0) return;
      enterAt = performance.now();
      observer = new MutationObserver(check);
      observer.observe(document.body, { subtree: true, childList: true, attributes: true });
      // the observer catches the commit; the frame poll catches a change of layout alone
      requestAnimationFrame(poll);
    }
    document.addEventListener('keydown', onKey, true);
    const timer = setTimeout(() => {
      finish();
      const said = [...document.querySelectorAll('[role="alert"], [role="status"], main h2')]
        .map((n) => (n.textContent ?? '').trim())
        .filter(Boolean)
        .join(' | ');
      const phase = enterAt < 0 ? 'Enter never reached the page' : 'no reading form became ready';
      reject(new Error(`${serial}: ${phase} within ${timeoutMs} ms. The page says: ${said.slice(0, 500)}`));
    }, timeoutMs);
  });
  // awaited by the next page.evaluate; this keeps an early rejection from being reported as unhandled
  pending.catch(() => undefined);
  w.__coretrailBenchScan = pending;
}

export function awaitProbe(): Promise<ProbeResult> {
  const w = window as unknown as Record<string, Promise<ProbeResult> | undefined>;
  const p = w.__coretrailBenchScan;
  if (!p) throw new Error('the scan probe was not armed');
  return p;
}
