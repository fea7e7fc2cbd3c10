import type { Band } from './gauge-study.js';
import { type CohenKappa, type FleissKappa, type Proportion, cohenKappa, fleissKappa, proportion } from './kappa.js';
import { StudyDataError } from './study-error.js';

/**
 * An attribute agreement study for a pass/fail (or few-class) check such as a crack or leak
 * test: each appraiser judges each part several times, blind, and where the right answer is known
 * (a master part, an expert's call) each judgement is held to it.
 *
 * It reports what such a study is read by (AIAG MSA 4th ed., attribute studies; the layout of the
 * figures is ours): agreement within each appraiser, of each appraiser with the reference,
 * between appraisers and of everyone with the reference, as counts of parts with an exact 95 %
 * interval; Cohen's kappa for each appraiser pair (trial by trial) and against the reference;
 * Fleiss' kappa within each appraiser and over all; and, where a category is named as the
 * nonconforming one, the miss and false-alarm rates per decision.
 */

export type AttributeStudyInput = {
  /** ratings[appraiser][part][trial]: the category each judgement gave. */
  ratings: readonly (readonly (readonly string[])[])[];
  /** The right answer for each part, where it is known. */
  reference?: readonly string[] | null;
  /** The category that means the part is bad (e.g. "fail"), for miss and false-alarm rates. */
  nonconforming?: string | null;
};

export type AppraiserAgreement = {
  appraiser: number;
  /** Parts on which all of this appraiser's trials agree. */
  within: Proportion;
  withinKappa: FleissKappa | null;
  /** Parts on which every trial matches the reference. */
  vsReference: Proportion | null;
  vsReferenceKappa: CohenKappa | null;
  /** Judgements (every trial of every part) that match the reference. */
  effectiveness: Proportion | null;
  /** Judgements of bad parts (by the reference) that called them anything else. */
  misses: Proportion | null;
  /** Judgements of good parts (by the reference) that called them bad. */
  falseAlarms: Proportion | null;
};

export type AttributeStudyResult = {
  shape: { appraisers: number; parts: number; trials: number };
  categories: string[];
  appraisers: AppraiserAgreement[];
  /** Parts on which every judgement of every appraiser agrees. */
  between: Proportion;
  /** Parts on which every judgement of every appraiser matches the reference. */
  allVsReference: Proportion | null;
  /** Fleiss' kappa with every appraiser's every trial as a rater. */
  overallKappa: FleissKappa | null;
  /** Cohen's kappa of each pair of appraisers, trial 1 against trial 1 and so on. */
  pairs: { first: number; second: number; kappa: CohenKappa | null }[];
};

function checkShape(input: AttributeStudyInput) {
  const { ratings, reference } = input;
  const appraisers = ratings.length;
  if (appraisers < 1) throw new StudyDataError('an attribute study needs at least one appraiser', 'ratings');
  const parts = Math.max(...ratings.map((byPart) => byPart.length));
  const trials = Math.max(...ratings.flatMap((byPart) => byPart.map((t) => t.length)));
  if (parts < 2) throw new StudyDataError('an attribute study needs at least 2 parts', 'ratings');
  if (trials < 2) throw new StudyDataError('each appraiser must judge each part at least twice', 'ratings');
  ratings.forEach((byPart, a) => {
    if (byPart.length !== parts) {
      throw new StudyDataError(`appraiser ${a + 1} judged ${byPart.length} parts, not ${parts}`, 'ratings');
    }
    byPart.forEach((byTrial, p) => {
      if (byTrial.length !== trials || byTrial.some((c) => typeof c !== 'string' || c.trim() === '')) {
        throw new StudyDataError(`appraiser ${a + 1}, part ${p + 1} needs ${trials} judgements`, 'ratings');
      }
    });
  });
  if (reference && reference.length !== parts) {
    throw new StudyDataError(`the reference gives ${reference.length} parts, not ${parts}`, 'reference');
  }
  if (input.nonconforming && !reference) {
    throw new StudyDataError('miss and false-alarm rates need the reference answer for each part', 'nonconforming');
  }
  return { appraisers, parts, trials };
}

/** Kappa is undefined when every judgement is the same; the study then reports none. */
function orNull<T>(f: () => T): T | null {
  try {
    return f();
  } catch (e) {
    if (e instanceof StudyDataError) return null;
    throw e;
  }
}

const allSame = (xs: readonly string[]) => xs.every((x) => x === xs[0]);

function appraiserAgreement(
  byPart: readonly (readonly string[])[],
  appraiser: number,
  reference: readonly string[] | null,
  nonconforming: string | null,
): AppraiserAgreement {
  const parts = byPart.length;
  const within = proportion(byPart.filter(allSame).length, parts);
  const withinKappa = orNull(() => fleissKappa(byPart));
  if (!reference) {
    const none = { vsReference: null, vsReferenceKappa: null, effectiveness: null, misses: null, falseAlarms: null };
    return { appraiser, within, withinKappa, ...none };
  }
  const vsReference = proportion(byPart.filter((ts, p) => ts.every((c) => c === reference[p])).length, parts);
  const judged = byPart.flatMap((ts, p) => ts.map((c) => ({ c, truth: reference[p]! })));
  const vsReferenceKappa = orNull(() =>
    cohenKappa(
      judged.map((j) => j.c),
      judged.map((j) => j.truth),
    ),
  );
  const effectiveness = proportion(judged.filter((j) => j.c === j.truth).length, judged.length);
  const known = { appraiser, within, withinKappa, vsReference, vsReferenceKappa, effectiveness };
  if (!nonconforming) return { ...known, misses: null, falseAlarms: null };
  const bad = judged.filter((j) => j.truth === nonconforming);
  const good = judged.filter((j) => j.truth !== nonconforming);
  return {
    ...known,
    misses: proportion(bad.filter((j) => j.c !== nonconforming).length, bad.length),
    falseAlarms: proportion(good.filter((j) => j.c === nonconforming).length, good.length),
  };
}

export function attributeAgreement(input: AttributeStudyInput): AttributeStudyResult {
  const shape = checkShape(input);
  const { ratings } = input;
  const reference = input.reference ?? null;
  const nonconforming = input.nonconforming ?? null;
  const categories = [...new Set([...ratings.flat(2), ...(reference ?? [])])].sort();

  const appraisers = ratings.map((byPart, a) => appraiserAgreement(byPart, a, reference, nonconforming));
  const everyone = (p: number) => ratings.flatMap((byPart) => byPart[p]!);
  const partIndexes = Array.from({ length: shape.parts }, (_, p) => p);
  const between = proportion(partIndexes.filter((p) => allSame(everyone(p))).length, shape.parts);
  const allVsReference = reference
    ? proportion(partIndexes.filter((p) => everyone(p).every((c) => c === reference[p])).length, shape.parts)
    : null;
  const overallKappa = orNull(() => fleissKappa(partIndexes.map(everyone)));

  const pairs: AttributeStudyResult['pairs'] = [];
  for (let a = 0; a < shape.appraisers; a++) {
    for (let b = a + 1; b < shape.appraisers; b++) {
      const kappa = orNull(() => cohenKappa(ratings[a]!.flat(), ratings[b]!.flat()));
      pairs.push({ first: a, second: b, kappa });
    }
  }
  return { shape, categories, appraisers, between, allVsReference, overallKappa, pairs };
}

/**
 * Guideline bands for an attribute study (AIAG MSA 4th ed., from memory). Kappa: above 0.75 good
 * agreement, below 0.40 poor. Per decision against the reference: effectiveness (share of
 * correct decisions) ≥ 90 % acceptable, ≥ 80 % marginal; miss rate ≤ 2 % / ≤ 5 %; false-alarm rate
 * ≤ 5 % / ≤ 10 %. A plant may set stricter limits for a safety check.
 */
export const attributeBands = {
  kappa: (k: number): Band => (k > 0.75 ? 'acceptable' : k >= 0.4 ? 'conditional' : 'unacceptable'),
  effectiveness: (percent: number): Band =>
    percent >= 90 ? 'acceptable' : percent >= 80 ? 'conditional' : 'unacceptable',
  missRate: (percent: number): Band => (percent <= 2 ? 'acceptable' : percent <= 5 ? 'conditional' : 'unacceptable'),
  falseAlarmRate: (percent: number): Band =>
    percent <= 5 ? 'acceptable' : percent <= 10 ? 'conditional' : 'unacceptable',
};
