import {
  type GaugeStudyGrid,
  type GaugeStudyOptions,
  type GrrFigures,
  type StudyMeans,
  type StudyShape,
  grrFigures,
  studyMeans,
  studyShape,
} from './gauge-study.js';
import { fUpperTail } from './special-functions.js';
import { StudyDataError } from './study-error.js';

/**
 * Variable gauge R&R by two-way ANOVA with the appraiser × part interaction (AIAG MSA 4th ed.,
 * ANOVA method). Parts and appraisers are random effects; the variance components come from the
 * expected mean squares, and a negative estimate is set to zero as the manual does.
 *
 * F statistics in the full table are taken against the repeatability mean square, as the
 * manual's ANOVA table prints them (from memory; R's aov gives the same). When the interaction's
 * p-value is above the pooling threshold the interaction is pooled into repeatability, a second
 * table without it is given, and the components come from that. The threshold is 0.25 unless
 * set: the default of R's qualityTools::gageRR (its documentation: "alpha value for discarding
 * the interaction … By default alpha is set to 0.25"); Minitab's documentation drops it at 0.05.
 */

export type AnovaSource = 'appraiser' | 'part' | 'interaction' | 'repeatability' | 'total';

export type AnovaRow = {
  source: AnovaSource;
  df: number;
  ss: number;
  ms: number | null;
  f: number | null;
  p: number | null;
};

export type AnovaOptions = GaugeStudyOptions & {
  /** Pool the interaction into repeatability when its p-value is above this; 0.25 unless set. */
  poolAbove?: number;
};

export type AnovaResult = GrrFigures & {
  method: 'anova';
  shape: StudyShape;
  means: StudyMeans;
  /** Appraiser, part, interaction, repeatability and total. */
  table: AnovaRow[];
  /** The interaction's p-value in the full table. */
  interactionP: number;
  pooled: boolean;
  poolAbove: number;
  /** Appraiser, part, repeatability (interaction pooled in) and total; null when not pooled. */
  pooledTable: AnovaRow[] | null;
  /** Variance of each component (σ²), as the manual's variance column prints them. */
  variance: GrrFigures['sigma'];
};

type SumsOfSquares = { a: number; p: number; ap: number; e: number; t: number };

function sumsOfSquares(readings: GaugeStudyGrid, shape: StudyShape, m: StudyMeans): SumsOfSquares {
  const { appraisers: k, parts: n, trials: r } = shape;
  const sq = (x: number) => x * x;
  const a = n * r * m.appraiser.reduce((s, x) => s + sq(x - m.grand), 0);
  const p = k * r * m.part.reduce((s, x) => s + sq(x - m.grand), 0);
  let ap = 0;
  let e = 0;
  let t = 0;
  readings.forEach((byPart, i) =>
    byPart.forEach((byTrial, j) => {
      const cell = m.cell[i]![j]!;
      ap += r * sq(cell - m.appraiser[i]! - m.part[j]! + m.grand);
      for (const x of byTrial) {
        e += sq(x - cell);
        t += sq(x - m.grand);
      }
    }),
  );
  return { a, p, ap, e, t };
}

/** F and p against a denominator; a zero denominator gives no F (and p 0 or 1 by the numerator). */
function test(ms: number, df: number, msDen: number, dfDen: number): { f: number | null; p: number } {
  if (msDen > 0) {
    const f = ms / msDen;
    return { f, p: fUpperTail(f, df, dfDen) };
  }
  return { f: null, p: ms > 0 ? 0 : 1 };
}

function row(source: AnovaSource, df: number, ss: number, against?: { ms: number; df: number }): AnovaRow {
  const ms = source === 'total' ? null : ss / df;
  if (!against || ms === null) return { source, df, ss, ms, f: null, p: null };
  return { source, df, ss, ms, ...test(ms, df, against.ms, against.df) };
}

export function anovaGaugeStudy(readings: GaugeStudyGrid, options: AnovaOptions = {}): AnovaResult {
  const poolAbove = options.poolAbove ?? 0.25;
  if (!(poolAbove >= 0 && poolAbove <= 1)) {
    throw new StudyDataError('the pooling threshold is a p-value between 0 and 1', 'poolAbove');
  }
  const shape = studyShape(readings);
  const { appraisers: k, parts: n, trials: r } = shape;
  const means = studyMeans(readings, shape);
  const ss = sumsOfSquares(readings, shape, means);
  const df = { a: k - 1, p: n - 1, ap: (k - 1) * (n - 1), e: k * n * (r - 1), t: k * n * r - 1 };
  const msE = ss.e / df.e;
  const msAP = ss.ap / df.ap;
  const msA = ss.a / df.a;
  const msP = ss.p / df.p;

  const error = { ms: msE, df: df.e };
  const table = [
    row('appraiser', df.a, ss.a, error),
    row('part', df.p, ss.p, error),
    row('interaction', df.ap, ss.ap, error),
    row('repeatability', df.e, ss.e),
    row('total', df.t, ss.t),
  ];
  const interactionP = table[2]!.p!;
  const pooled = interactionP > poolAbove;

  let variance: { ev: number; av: number; interaction: number; pv: number };
  let pooledTable: AnovaRow[] | null = null;
  if (pooled) {
    const pooledError = { ms: (ss.ap + ss.e) / (df.ap + df.e), df: df.ap + df.e };
    pooledTable = [
      row('appraiser', df.a, ss.a, pooledError),
      row('part', df.p, ss.p, pooledError),
      row('repeatability', pooledError.df, ss.ap + ss.e),
      row('total', df.t, ss.t),
    ];
    variance = {
      ev: pooledError.ms,
      av: Math.max(0, (msA - pooledError.ms) / (n * r)),
      interaction: 0,
      pv: Math.max(0, (msP - pooledError.ms) / (k * r)),
    };
  } else {
    // Expected mean squares of the two-way random model with interaction.
    variance = {
      ev: msE,
      av: Math.max(0, (msA - msAP) / (n * r)),
      interaction: Math.max(0, (msAP - msE) / r),
      pv: Math.max(0, (msP - msAP) / (k * r)),
    };
  }
  const figures = grrFigures(variance, options);
  const grr = variance.ev + variance.av + variance.interaction;
  return {
    ...figures,
    method: 'anova',
    shape,
    means,
    table,
    interactionP,
    pooled,
    poolAbove,
    pooledTable,
    variance: { ...variance, grr, tv: grr + variance.pv },
  };
}
