import { StudyDataError } from './study-error.js';

/**
 * What the two variable gauge R&R methods (gauge-rr-range.ts, gauge-rr-anova.ts) share: the
 * grid, its checks, the means every method starts from, and the AIAG acceptance guidelines.
 *
 * Edition: AIAG Measurement Systems Analysis reference manual, 4th edition (2010). Its variation
 * figures are standard deviations (σ), so %EV, %AV, %GRR and %PV against total variation do not
 * depend on any multiplier. Only %tolerance does: the 4th edition compares 6σ with the tolerance
 * (from memory); 5.15σ is the 3rd edition's spread and is offered for plants that still quote it.
 */
export const MSA_EDITION = 'AIAG MSA 4th edition (2010)';

/** readings[appraiser][part][trial], every appraiser measuring every part the same number of times. */
export type GaugeStudyGrid = readonly (readonly (readonly number[])[])[];

export type StudySpread = 6 | 5.15;

export type GaugeStudyOptions = {
  /** Upper minus lower specification limit, in the readings' unit; omit for %TV only. */
  tolerance?: number | null;
  /** σ multiplier for %tolerance: 6 (4th edition, the default) or 5.15 (3rd edition). */
  studySpread?: StudySpread;
};

export type StudyShape = { appraisers: number; parts: number; trials: number };

/** The AIAG guideline bands for %GRR. */
export type Band = 'acceptable' | 'conditional' | 'unacceptable';

/** One figure per source of variation (σ, a percentage or a variance, as the field says). */
export type ByComponent = { ev: number; av: number; interaction: number; grr: number; pv: number; tv: number };

export type GrrFigures = {
  /** Standard deviations. */
  sigma: ByComponent;
  /** 100 × σ / σ_TV: the "% of total variation" column (so tv is 100). */
  percentOfTotal: ByComponent;
  /** 100 × σ² / σ²_TV: the "% contribution" some reports add. */
  percentContribution: ByComponent;
  /** 100 × spread × σ / tolerance; null without a tolerance. tv is left out (it has no meaning here). */
  percentOfTolerance: Omit<ByComponent, 'tv'> | null;
  /** 1.41 × PV / GRR truncated to a whole number; null when the study shows no gauge variation at all. */
  ndc: number | null;
  /** 1.41 × PV / GRR before truncation (null as above). */
  ndcRaw: number | null;
  bands: { total: Band; tolerance: Band | null; ndcAdequate: boolean };
  /** The study's overall reading; see verdictOf. */
  verdict: Band;
  studySpread: StudySpread;
  tolerance: number | null;
  edition: typeof MSA_EDITION;
};

/** Checks the grid is complete, rectangular and numeric; returns its shape. */
export function studyShape(readings: GaugeStudyGrid): StudyShape {
  const appraisers = readings.length;
  if (appraisers < 2) throw new StudyDataError('a gauge study needs at least 2 appraisers', 'readings');
  // The longest row sets the expected size, so a message names the row that is short of it.
  const parts = Math.max(...readings.map((byPart) => byPart.length));
  if (parts < 2) throw new StudyDataError('a gauge study needs at least 2 parts', 'readings');
  const trials = Math.max(...readings.flatMap((byPart) => byPart.map((byTrial) => byTrial.length)));
  if (trials < 2) throw new StudyDataError('a gauge study needs at least 2 trials of each part', 'readings');
  readings.forEach((byPart, a) => {
    if (byPart.length !== parts) {
      throw new StudyDataError(`appraiser ${a + 1} measured ${byPart.length} parts, not ${parts}`, 'readings');
    }
    byPart.forEach((byTrial, p) => {
      if (byTrial.length !== trials) {
        throw new StudyDataError(
          `appraiser ${a + 1}, part ${p + 1} has ${byTrial.length} trials, not ${trials}`,
          'readings',
        );
      }
      byTrial.forEach((x, t) => {
        if (typeof x !== 'number' || !Number.isFinite(x)) {
          throw new StudyDataError(`appraiser ${a + 1}, part ${p + 1}, trial ${t + 1} is not a number`, 'readings');
        }
      });
    });
  });
  return { appraisers, parts, trials };
}

const mean = (xs: readonly number[]) => xs.reduce((s, x) => s + x, 0) / xs.length;

export type StudyMeans = {
  /** cell[appraiser][part]: the mean of that appraiser's trials on that part. */
  cell: number[][];
  /** range[appraiser][part]: max − min of those trials. */
  range: number[][];
  appraiser: number[];
  part: number[];
  grand: number;
};

export function studyMeans(readings: GaugeStudyGrid, shape: StudyShape): StudyMeans {
  const cell = readings.map((byPart) => byPart.map(mean));
  const range = readings.map((byPart) => byPart.map((xs) => Math.max(...xs) - Math.min(...xs)));
  const appraiser = cell.map(mean);
  const part = Array.from({ length: shape.parts }, (_, p) => mean(cell.map((row) => row[p]!)));
  return { cell, range, appraiser, part, grand: mean(appraiser) };
}

/** AIAG MSA 4th ed. guidelines (from memory): under 10 % acceptable, 10–30 % may be acceptable, over 30 % not. */
export function bandOf(percentGrr: number): Band {
  if (percentGrr < 10) return 'acceptable';
  if (percentGrr <= 30) return 'conditional';
  return 'unacceptable';
}

/**
 * The study's one-word reading, which the product flags a gauge by. A gauge that judges parts
 * against limits is read by %GRR of the tolerance; without a tolerance it is read as a process
 * gauge: %GRR of total variation, and fewer than 5 distinct categories makes it unacceptable
 * (AIAG asks for ndc ≥ 5, from memory). This combination is the product's rule, not the manual's.
 */
export function verdictOf(bands: GrrFigures['bands']): Band {
  if (bands.tolerance) return bands.tolerance;
  return bands.ndcAdequate ? bands.total : 'unacceptable';
}

/** The figures both methods report, from the variances of each source. */
export function grrFigures(
  variance: { ev: number; av: number; interaction: number; pv: number },
  options: GaugeStudyOptions = {},
): GrrFigures {
  const tolerance = options.tolerance ?? null;
  if (tolerance !== null && !(Number.isFinite(tolerance) && tolerance > 0)) {
    throw new StudyDataError('the tolerance must be a positive number', 'tolerance');
  }
  const studySpread = options.studySpread ?? 6;
  if (studySpread !== 6 && studySpread !== 5.15) {
    throw new StudyDataError('the study spread is 6 (4th edition) or 5.15 (3rd edition)', 'studySpread');
  }
  const v = { ...variance, grr: variance.ev + variance.av + variance.interaction, tv: 0 };
  v.tv = v.grr + v.pv;
  if (!(v.tv > 0)) {
    throw new StudyDataError('every reading is the same, so the study shows no variation to judge', 'readings');
  }
  const sigma = mapComponents(v, Math.sqrt);
  const percentOfTotal = mapComponents(sigma, (s) => (100 * s) / sigma.tv);
  const percentContribution = mapComponents(v, (x) => (100 * x) / v.tv);
  const percentOfTolerance =
    tolerance === null ? null : omitTv(mapComponents(sigma, (s) => (100 * studySpread * s) / tolerance));
  // AIAG: ndc = 1.41 × (PV / GRR), truncated to the integer (from memory).
  const ndcRaw = sigma.grr > 0 ? (1.41 * sigma.pv) / sigma.grr : null;
  const ndc = ndcRaw === null ? null : Math.floor(ndcRaw);
  const bands = {
    total: bandOf(percentOfTotal.grr),
    tolerance: percentOfTolerance ? bandOf(percentOfTolerance.grr) : null,
    ndcAdequate: ndc === null || ndc >= 5,
  };
  return {
    sigma,
    percentOfTotal,
    percentContribution,
    percentOfTolerance,
    ndc,
    ndcRaw,
    bands,
    verdict: verdictOf(bands),
    studySpread,
    tolerance,
    edition: MSA_EDITION,
  };
}

function mapComponents(c: ByComponent, f: (x: number) => number): ByComponent {
  return { ev: f(c.ev), av: f(c.av), interaction: f(c.interaction), grr: f(c.grr), pv: f(c.pv), tv: f(c.tv) };
}

function omitTv(c: ByComponent): Omit<ByComponent, 'tv'> {
  const { tv: _tv, ...rest } = c;
  return rest;
}
