import { judgeValue, limitsOf, type ToleranceRule, type Verdict } from '../tolerance.js';
import { capability, type Capability } from './capability.js';
import { individualsLimits, partMeansLimits, sigmaWithin } from './limits.js';

/**
 * Rehearsing a rule before it is signed: the stored readings of a characteristic judged again
 * against a draft rule, by the same judge the station uses (judgeValue: ASTM E29 rounding to the
 * resolution, inclusive limits), to show which readings and parts would change verdict and what
 * the capability would become. Nothing is changed; stored verdicts keep the rule they were judged by.
 */

/** A stored reading of one characteristic, in the order it was taken, with the verdict it got. */
export type StoredReading = { partId: string; position: string; value: number | null; verdict: Verdict };

export type Flip = 'pass-to-fail' | 'fail-to-pass';

export type ReadingFlip = {
  partId: string;
  position: string;
  value: number;
  rounded: number;
  was: Verdict;
  now: Verdict;
  flip: Flip;
  reason: string;
};

export type PartFlip = { partId: string; was: Verdict; now: Verdict; flip: Flip; failingPositions: string[] };

/** One part's stored readings side by side (as the database keeps them): no object per reading. */
export type PartColumns = {
  partId: string;
  positions: readonly string[];
  values: readonly (number | null)[];
  verdicts: readonly Verdict[];
};

export type RehearsalInput = {
  readings: readonly StoredReading[];
  /** The draft rule. */
  rule: ToleranceRule;
  /** The rule in force, for the capability before the change. */
  current?: ToleranceRule | null;
  /** The characteristic's resolution and unit, used where the rule sets none (as the station form does). */
  resolution?: number | null;
  unit?: string | null;
  /** Short-term σ from the characteristic's control chart; estimated from the readings when absent. */
  sigmaWithin?: number | null;
  confidence?: number;
};

export type Rehearsal = {
  /** Only the readings and parts whose verdict would change. */
  readings: ReadingFlip[];
  parts: PartFlip[];
  counts: {
    readings: number;
    /** Readings without a value (not recorded, or pass/fail results): not rejudged. */
    skipped: number;
    readingsPassToFail: number;
    readingsFailToPass: number;
    parts: number;
    partsPassToFail: number;
    partsFailToPass: number;
    partsFailingBefore: number;
    partsFailingAfter: number;
  };
  capability: { before: Capability | null; after: Capability | null; sigmaWithin: number | null };
};

const flipOf = (was: Verdict, now: Verdict): Flip | null =>
  was === now ? null : was === 'pass' ? 'pass-to-fail' : 'fail-to-pass';

/**
 * The short-term σ the readings imply when the caller has none: part means and within-part
 * spread when every part has the same number of readings (two or more), the moving range when
 * each part has one; otherwise none, and the rehearsal shows Ppk alone.
 */
function estimateSigma(byPart: Map<string, number[]>): number | null {
  const parts = [...byPart.entries()].map(([key, values]) => ({ key, values }));
  const sizes = new Set(parts.map((p) => p.values.length));
  if (parts.length < 2 || sizes.size !== 1) return null;
  const n = parts[0]!.values.length;
  const limits =
    n === 1 ? individualsLimits(parts.map((p) => ({ key: p.key, value: p.values[0]! }))) : partMeansLimits(parts);
  const sigma = sigmaWithin(limits);
  return sigma > 0 ? sigma : null;
}

function capabilityOf(
  values: number[],
  rule: ToleranceRule | null | undefined,
  sigma: number | null,
  confidence?: number,
) {
  if (!rule || values.length < 2) return null;
  const spec = limitsOf(rule);
  if (spec.lower === null && spec.upper === null) return null;
  return capability(values, spec, { sigmaWithin: sigma, confidence });
}

export function rehearseRule(input: RehearsalInput): Rehearsal {
  return rehearseWith(input, input.readings.length, (visit) => {
    for (const r of input.readings) visit(r.partId, r.position, r.value, r.verdict);
  });
}

/**
 * The same rehearsal from each part's readings side by side: a year of a V8 bore is 239,424
 * readings, and an object for each cost more than the judging (and as much again in garbage
 * collection).
 */
export function rehearseParts(input: Omit<RehearsalInput, 'readings'> & { parts: readonly PartColumns[] }): Rehearsal {
  let total = 0;
  for (const p of input.parts) total += p.positions.length;
  return rehearseWith(input, total, (visit) => {
    for (const p of input.parts) {
      for (let k = 0; k < p.positions.length; k++) {
        visit(p.partId, p.positions[k]!, p.values[k] ?? null, p.verdicts[k]!);
      }
    }
  });
}

type Visit = (partId: string, position: string, value: number | null, verdict: Verdict) => void;

function rehearseWith(input: Omit<RehearsalInput, 'readings'>, total: number, each: (visit: Visit) => void): Rehearsal {
  const draft = {
    ...input.rule,
    resolution: input.rule.resolution ?? input.resolution,
    unit: input.rule.unit ?? input.unit,
  };
  const readings: ReadingFlip[] = [];
  const parts = new Map<string, { was: Verdict; now: Verdict; failing: string[] }>();
  const byPart = new Map<string, number[]>();
  const values: number[] = [];
  let skipped = 0;
  // a year of readings holds few distinct values (they are rounded to the gauge's resolution):
  // judging each value once keeps the decimal arithmetic off the per-reading path
  const judged = new Map<number, ReturnType<typeof judgeValue>>();

  let part: { was: Verdict; now: Verdict; failing: string[] } | undefined;
  let partValues: number[] | undefined;
  let current: string | null = null;
  each((partId, position, value, verdict) => {
    if (value === null) {
      skipped++;
      return;
    }
    let j = judged.get(value);
    if (!j) judged.set(value, (j = judgeValue(value, draft)));
    // readings come a part at a time: look the part up only when it changes
    if (partId !== current || !part || !partValues) {
      current = partId;
      part = parts.get(partId);
      if (!part) parts.set(partId, (part = { was: 'pass', now: 'pass', failing: [] }));
      partValues = byPart.get(partId);
      if (!partValues) byPart.set(partId, (partValues = []));
    }
    if (verdict === 'fail') part.was = 'fail';
    if (j.verdict === 'fail') {
      part.now = 'fail';
      part.failing.push(position);
    }
    partValues.push(value);
    values.push(value);
    const flip = flipOf(verdict, j.verdict);
    if (flip) {
      readings.push({
        partId,
        position,
        value,
        rounded: j.rounded!,
        was: verdict,
        now: j.verdict,
        flip,
        reason: j.reason,
      });
    }
  });

  const partFlips: PartFlip[] = [];
  for (const [partId, p] of parts) {
    const flip = flipOf(p.was, p.now);
    if (flip) partFlips.push({ partId, was: p.was, now: p.now, flip, failingPositions: p.failing });
  }
  const all = [...parts.values()];
  const sigma = input.sigmaWithin ?? estimateSigma(byPart);
  return {
    readings,
    parts: partFlips,
    counts: {
      readings: total,
      skipped,
      readingsPassToFail: readings.filter((r) => r.flip === 'pass-to-fail').length,
      readingsFailToPass: readings.filter((r) => r.flip === 'fail-to-pass').length,
      parts: parts.size,
      partsPassToFail: partFlips.filter((p) => p.flip === 'pass-to-fail').length,
      partsFailToPass: partFlips.filter((p) => p.flip === 'fail-to-pass').length,
      partsFailingBefore: all.filter((p) => p.was === 'fail').length,
      partsFailingAfter: all.filter((p) => p.now === 'fail').length,
    },
    capability: {
      before: capabilityOf(values, input.current, sigma, input.confidence),
      after: capabilityOf(values, draft, sigma, input.confidence),
      sigmaWithin: sigma,
    },
  };
}
