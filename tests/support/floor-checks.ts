import AxeBuilder from '@axe-core/playwright';
import type { Page } from 'playwright-core';

/** Serious or critical accessibility problems on the page, target size included. */
export async function axeProblems(page: Page): Promise<string[]> {
  // WCAG 2.2 target size is 24 px at AA; floor screens ask 44 px (WCAG 2.5.5, AAA), the project's own rule
  const axe = await new AxeBuilder({ page }).options({ rules: { 'target-size': { enabled: true } } }).analyze();
  return axe.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => `${v.id}: ${v.nodes.length} (${v.nodes.map((n) => n.target.join(' ')).join(', ')})`);
}

/** Every visible control in the page's main part smaller than `min` px either way, by its name. */
export async function smallTargets(page: Page, min = 44): Promise<string[]> {
  return page.evaluate((floor) => {
    const out: string[] = [];
    for (const el of document.querySelectorAll<HTMLElement>('main button, main input, main select, main a')) {
      const r = el.getBoundingClientRect();
      if (r.width === 0 || r.height === 0) continue;
      // a radio or checkbox is drawn inside its tile (the tile is the target), a link inside running text is text
      if (el instanceof HTMLInputElement && (el.type === 'checkbox' || el.type === 'radio')) continue;
      if (el.tagName === 'A' && el.closest('p, td, dd, span, li > span')) continue;
      if (r.height < floor - 0.5 || r.width < floor - 0.5)
        out.push(
          `${el.tagName} ${el.getAttribute('aria-label') ?? el.textContent?.trim() ?? ''}: ${Math.round(r.width)}×${Math.round(r.height)}`,
        );
    }
    return out;
  }, min);
}

/**
 * The header at this width: every link and control inside the window, none overlapping another and
 * none with its words cut off (wider than its box). Returns what is wrong, in words.
 */
export async function headerProblems(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const out: string[] = [];
    const header = document.querySelector('header')!;
    const els = [...header.querySelectorAll<HTMLElement>('a, button, nav a, p')].filter((el) => {
      const r = el.getBoundingClientRect();
      return r.width > 0 && r.height > 0 && !el.closest('.sr-only');
    });
    const name = (el: HTMLElement) => el.textContent?.trim().slice(0, 30) ?? el.tagName;
    const boxes = els.map((el) => ({ el, r: el.getBoundingClientRect() }));
    for (const { el, r } of boxes) {
      if (r.left < 0 || r.right > window.innerWidth + 0.5) out.push(`${name(el)} outside the window`);
      if (el.scrollWidth > el.clientWidth + 1) out.push(`${name(el)} cut off`);
    }
    for (let i = 0; i < boxes.length; i++)
      for (let j = i + 1; j < boxes.length; j++) {
        const a = boxes[i]!;
        const b = boxes[j]!;
        if (a.el.contains(b.el) || b.el.contains(a.el)) continue;
        const overlap =
          a.r.left < b.r.right - 1 && b.r.left < a.r.right - 1 && a.r.top < b.r.bottom - 1 && b.r.top < a.r.bottom - 1;
        if (overlap) out.push(`${name(a.el)} overlaps ${name(b.el)}`);
      }
    if (document.documentElement.scrollWidth > window.innerWidth) out.push('the page scrolls sideways');
    return out;
  });
}
