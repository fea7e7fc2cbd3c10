import { gaugeFits, type Fit } from '../../shared/domain/gauge-fit.js';
import { limitsOf } from '../../shared/domain/tolerance.js';
import { todayIn } from '../../shared/domain/warranty.js';
import { DUE_SOON_DAYS, type GaugeState } from '../../shared/schemas/gauges.js';
import type { GaugeChoice } from '../../shared/schemas/results.js';
import type { Gauge } from '../models/index.js';
import type { Reference } from './reference-cache.js';
import type { formCharacteristics } from './spec/rules.js';

type FormChar = ReturnType<typeof formCharacteristics>[number];

const num = (v: unknown) => (v === null || v === undefined ? null : Number(v));
const DAY = 86_400_000;

/** Whole days from `today` to `on` (both plant calendar dates). */
export const daysBetween = (today: string, on: string) =>
  Math.round((Date.parse(`${on}T00:00:00Z`) - Date.parse(`${today}T00:00:00Z`)) / DAY);

/**
 * Whether a gauge may take a judged reading today (the plant's today): in use, with a calibration
 * record that left it in tolerance, and not past its due date. Due and overdue are the plant's
 * calendar, so a gauge due today is still usable all of today wherever the server is.
 */
export function gaugeState(g: Gauge, today: string): { state: GaugeState; usable: boolean; why: string } {
  if (g.status !== 'in_use') {
    const why =
      g.status === 'out_of_tolerance'
        ? 'Found out of tolerance: quality must assess what it measured before it is used again.'
        : g.status === 'out_for_calibration'
          ? 'Out for calibration.'
          : 'Retired.';
    return { state: g.status, usable: false, why };
  }
  if (!g.calibrated || !g.calibrationDueOn) {
    return {
      state: 'never_calibrated',
      usable: false,
      why: 'No calibration on record: it cannot take a judged reading.',
    };
  }
  const days = daysBetween(today, g.calibrationDueOn);
  if (days < 0) return { state: 'overdue', usable: false, why: `Calibration was due on ${g.calibrationDueOn}.` };
  if (days <= DUE_SOON_DAYS) {
    return {
      state: 'due',
      usable: true,
      why: `Calibrated; due ${g.calibrationDueOn} (${days} day${days === 1 ? '' : 's'} left).`,
    };
  }
  return { state: 'in_use', usable: true, why: `Calibrated; due ${g.calibrationDueOn}.` };
}

/** Whether gauge `g` can measure characteristic `c` as its rule in force stands. */
export function fitOf(ref: Reference, g: Gauge, c: FormChar): Fit {
  const limits = c.rule ? limitsOf(c.rule) : { lower: null, upper: null };
  const ratio = num(ref.characteristic(c.id)?.gaugeRatio) ?? 10;
  return gaugeFits(
    {
      code: g.code,
      unit: g.unit,
      resolution: num(g.resolution),
      rangeLow: num(g.rangeLow),
      rangeHigh: num(g.rangeHigh),
    },
    { name: c.name, unit: c.unit, lower: limits.lower, upper: limits.upper, physicalMin: c.physicalMin, ratio },
  );
}

/** The gauges with their calibration state today, and for each measured characteristic why it cannot read it. */
export function gaugeChoices(
  ref: Reference,
  chars: FormChar[],
): { choices: GaugeChoice[]; byCode: Map<string, Gauge>; today: string } {
  const today = todayIn(ref.timeZone);
  const measured = chars.filter((c) => c.kind === 'variable');
  const choices = ref.gauges
    .filter((g) => g.status !== 'retired')
    .map((g): GaugeChoice => {
      const s = gaugeState(g, today);
      const unfit: Record<string, string> = {};
      for (const c of measured) {
        const fit = fitOf(ref, g, c);
        if (!fit.ok) unfit[c.code] = fit.message;
      }
      return {
        code: g.code,
        description: g.description,
        unit: g.unit,
        resolution: num(g.resolution),
        rangeLow: num(g.rangeLow),
        rangeHigh: num(g.rangeHigh),
        calibrationDueOn: g.calibrationDueOn,
        usable: s.usable,
        why: s.why,
        unfit,
        studyFailed: g.studyVerdict === 'unacceptable',
      };
    });
  return { choices, byCode: new Map(ref.gauges.map((g) => [g.code, g])), today };
}
