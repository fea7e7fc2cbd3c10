import type { Page } from 'playwright-core';
import { nominalSizeClasses, passingReadings } from '../../db/seeders/sample-readings.js';
import type { StationFormJson } from '../../shared/schemas/results.js';

/**
 * Types a passing reading into every box of a station form, and Pass on every check, as an operator
 * would; where a characteristic has size classes, chooses the one its readings are taken around.
 */
export async function fillPassing(page: Page, form: StationFormJson) {
  for (const [code, k] of Object.entries(nominalSizeClasses(form))) {
    const c = form.characteristics.find((x) => x.code === code)!;
    await page.getByRole('combobox', { name: `${c.name}: size class finished to`, exact: true }).selectOption(k);
  }
  for (const r of passingReadings(form)) {
    const c = form.characteristics.find((x) => x.code === r.characteristic)!;
    const label = c.positions.find((x) => x.code === r.position)!.label;
    const name = `${c.name}, ${label}`;
    if (r.passed !== undefined) {
      await page.getByRole('radiogroup', { name, exact: true }).getByRole('radio', { name: 'Pass' }).check();
    } else {
      await page.getByRole('textbox', { name, exact: true }).fill(String(r.value));
    }
  }
}

/** Taps a station's tile in the station chooser (its code is on the tile). */
export async function chooseStation(page: Page, code: string) {
  await page.getByRole('button', { name: new RegExp(`\\b${code}\\b`) }).click();
}
