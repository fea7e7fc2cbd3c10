import { betaQuantile } from './special-functions.js';
import { StudyDataError } from './study-error.js';

/**
 * Chance-corrected agreement for nominal ratings (pass/fail, or a few defect classes).
 *
 * Cohen's kappa for two raters: J. Cohen, "A coefficient of agreement for nominal scales",
 * Educational and Psychological Measurement 20 (1960) 37–46. Its standard error under "no
 * agreement beyond chance" is that of Fleiss, Cohen & Everitt, Psychological Bulletin 72 (1969).
 * Fleiss' kappa for a fixed number of ratings per subject: J. L. Fleiss, "Measuring nominal scale
 * agreement among many raters", Psychological Bulletin 76 (1971) 378–382, with its per-category
 * kappa and the null standard error of Fleiss, Nee & Landis (1979).
 */

export type CohenKappa = {
  n: number;
  categories: string[];
  /** table[i][j]: subjects the first rater put in category i and the second in j. */
  table: number[][];
  observed: number;
  expected: number;
  kappa: number;
  /** Standard error of kappa when the raters agree only by chance (null when it is undefined). */
  seNull: number | null;
  /** kappa / seNull: how far the agreement is beyond chance, in standard errors. */
  z: number | null;
};

export type FleissKappa = {
  subjects: number;
  ratersPerSubject: number;
  categories: string[];
  /** Share of all ratings in each category (p_j). */
  proportions: number[];
  observed: number;
  expected: number;
  kappa: number;
  /** Kappa for each category taken against all the others. */
  perCategory: (number | null)[];
  seNull: number | null;
  z: number | null;
};

const sum = (xs: readonly number[]) => xs.reduce((s, x) => s + x, 0);

function checkCounts(table: readonly (readonly number[])[], what: string) {
  for (const row of table) {
    for (const x of row) {
      if (!Number.isInteger(x) || x < 0) throw new StudyDataError(`${what} must be whole, non-negative counts`);
    }
  }
}

/** Cohen's kappa from a square table of counts (rows: first rater, columns: second). */
export function cohenKappaFromTable(table: readonly (readonly number[])[], categories?: readonly string[]): CohenKappa {
  const k = table.length;
  if (k < 2 || table.some((row) => row.length !== k)) {
    throw new StudyDataError('a two-rater table must be square, with at least 2 categories');
  }
  checkCounts(table, 'the table');
  const n = sum(table.map(sum));
  if (n === 0) throw new StudyDataError('the table has no ratings');
  const rows = table.map((row) => sum(row) / n);
  const cols = table[0]!.map((_, j) => sum(table.map((row) => row[j]!)) / n);
  const observed = sum(table.map((row, i) => row[i]!)) / n;
  const expected = sum(rows.map((r, i) => r * cols[i]!));
  if (expected === 1) {
    throw new StudyDataError('both raters used one category only, so chance agreement is total and kappa is undefined');
  }
  const kappa = (observed - expected) / (1 - expected);
  const inner = expected + expected ** 2 - sum(rows.map((r, i) => r * cols[i]! * (r + cols[i]!)));
  const seNull = inner > 0 ? Math.sqrt(inner / n) / (1 - expected) : null;
  return {
    n,
    categories: categories ? [...categories] : table.map((_, i) => String(i + 1)),
    table: table.map((row) => [...row]),
    observed,
    expected,
    kappa,
    seNull,
    z: seNull ? kappa / seNull : null,
  };
}

/** Cohen's kappa from two raters' ratings of the same subjects, in the same order. */
export function cohenKappa(first: readonly string[], second: readonly string[]): CohenKappa {
  if (first.length !== second.length) {
    throw new StudyDataError(
      `the raters rated ${first.length} and ${second.length} subjects; they must rate the same ones`,
    );
  }
  const categories = [...new Set([...first, ...second])].sort();
  if (categories.length < 2) {
    throw new StudyDataError('both raters used one category only, so chance agreement is total and kappa is undefined');
  }
  const index = new Map(categories.map((c, i) => [c, i]));
  const table = categories.map(() => categories.map(() => 0));
  first.forEach((c, s) => table[index.get(c)!]![index.get(second[s]!)!]!++);
  return cohenKappaFromTable(table, categories);
}

/** Fleiss' kappa from counts[subject][category]: how many raters put that subject in that category. */
export function fleissKappaFromCounts(
  counts: readonly (readonly number[])[],
  categories?: readonly string[],
): FleissKappa {
  const subjects = counts.length;
  if (subjects < 1) throw new StudyDataError('there are no subjects to rate');
  const k = counts[0]!.length;
  if (k < 2 || counts.some((row) => row.length !== k)) {
    throw new StudyDataError('every subject needs a count for each of at least 2 categories');
  }
  checkCounts(counts, 'the counts');
  const m = sum(counts[0]!);
  if (m < 2 || counts.some((row) => sum(row) !== m)) {
    throw new StudyDataError('every subject must be rated the same number of times, at least twice');
  }
  const total = subjects * m;
  const proportions = counts[0]!.map((_, j) => sum(counts.map((row) => row[j]!)) / total);
  const agreement = counts.map((row) => (sum(row.map((x) => x * x)) - m) / (m * (m - 1)));
  const observed = sum(agreement) / subjects;
  const expected = sum(proportions.map((p) => p * p));
  if (expected === 1) throw new StudyDataError('every rating is in one category, so kappa is undefined');
  const kappa = (observed - expected) / (1 - expected);
  const perCategory = proportions.map((p, j) => {
    if (p === 0 || p === 1) return null;
    const disagreement = sum(counts.map((row) => row[j]! * (m - row[j]!)));
    return 1 - disagreement / (total * (m - 1) * p * (1 - p));
  });
  const pq = proportions.map((p) => p * (1 - p));
  const spq = sum(pq);
  const inner = spq * spq - sum(pq.map((x, j) => x * (1 - 2 * proportions[j]!)));
  const seNull = inner > 0 ? (Math.SQRT2 * Math.sqrt(inner)) / (spq * Math.sqrt(total * (m - 1))) : null;
  return {
    subjects,
    ratersPerSubject: m,
    categories: categories ? [...categories] : counts[0]!.map((_, j) => String(j + 1)),
    proportions,
    observed,
    expected,
    kappa,
    perCategory,
    seNull,
    z: seNull ? kappa / seNull : null,
  };
}

/** Fleiss' kappa from ratings[subject][rating], each subject rated the same number of times. */
export function fleissKappa(ratings: readonly (readonly string[])[]): FleissKappa {
  const categories = [...new Set(ratings.flat())].sort();
  if (categories.length < 2) throw new StudyDataError('every rating is in one category, so kappa is undefined');
  const index = new Map(categories.map((c, i) => [c, i]));
  const counts = ratings.map((row) => {
    const c = categories.map(() => 0);
    for (const r of row) c[index.get(r)!]!++;
    return c;
  });
  return fleissKappaFromCounts(counts, categories);
}

export type Proportion = {
  count: number;
  of: number;
  /** count / of × 100; null when there was nothing to count. */
  percent: number | null;
  /** Exact (Clopper–Pearson) 95 % interval, in percent. */
  ci95: [number, number] | null;
};

/** A count out of a total with its exact binomial 95 % interval (Clopper & Pearson, Biometrika 1934). */
export function proportion(count: number, of: number): Proportion {
  if (of === 0) return { count, of, percent: null, ci95: null };
  const lo = count === 0 ? 0 : betaQuantile(0.025, count, of - count + 1);
  const hi = count === of ? 1 : betaQuantile(0.975, count + 1, of - count);
  return { count, of, percent: (100 * count) / of, ci95: [100 * lo, 100 * hi] };
}
