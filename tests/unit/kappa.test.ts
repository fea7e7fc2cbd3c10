import { describe, expect, it } from 'vitest';
import {
  cohenKappa,
  cohenKappaFromTable,
  fleissKappa,
  fleissKappaFromCounts,
  proportion,
} from '../../shared/domain/kappa.js';
import { StudyDataError } from '../../shared/domain/study-error.js';

describe("Cohen's kappa", () => {
  it('when two readers judge 50 grant proposals (Wikipedia, "Cohen\'s kappa", worked example), then p_o 0.70, p_e 0.50, κ 0.40', () => {
    // Both yes 20, A yes / B no 5, A no / B yes 10, both no 15.
    const k = cohenKappaFromTable([
      [20, 5],
      [10, 15],
    ]);
    expect(k.observed).toBeCloseTo(0.7, 12);
    expect(k.expected).toBeCloseTo(0.5, 12);
    expect(k.kappa).toBeCloseTo(0.4, 12);
  });
  it("when Cohen's own three-category example of 200 subjects is used (Cohen 1960, Table 1), then p_o .70, p_c .41, κ .492", () => {
    // Proportions (from memory of the paper): diagonal .44, .20, .06; row margins .60, .30, .10;
    // column margins .50, .30, .20. Kappa depends only on those, and the paper prints κ = .492.
    const k = cohenKappaFromTable([
      [88, 14, 18],
      [10, 40, 10],
      [2, 6, 12],
    ]);
    expect(k.observed).toBeCloseTo(0.7, 12);
    expect(k.expected).toBeCloseTo(0.41, 12);
    expect(k.kappa).toBeCloseTo(0.492, 3); // .29 / .59 = 0.4915
  });
  it('when a SAS PROC FREQ printout is the reference (quoted in statsmodels stats/tests/test_inter_rater.py), then κ 0.4842, ASE under H0 0.1484, Z 3.2626', () => {
    const k = cohenKappaFromTable([
      [0, 4, 1],
      [0, 8, 0],
      [0, 1, 5],
    ]);
    expect(k.kappa).toBeCloseTo(0.4842, 4);
    expect(k.seNull).toBeCloseTo(0.1484, 4);
    expect(k.z).toBeCloseTo(3.2626, 4);
  });
  it('when given the ratings themselves, then it builds the same table, categories sorted', () => {
    const a = ['pass', 'pass', 'fail', 'fail', 'pass', 'fail'];
    const b = ['pass', 'fail', 'fail', 'fail', 'pass', 'pass'];
    const k = cohenKappa(a, b);
    expect(k.categories).toEqual(['fail', 'pass']);
    expect(k.table).toEqual([
      [2, 1],
      [1, 2],
    ]);
    expect(k.kappa).toBeCloseTo(1 / 3, 12); // p_o 4/6, p_e ½: (2/3 − ½)/(½)
  });
  it('when the raters agree on every subject, then κ is 1; when one always says the opposite, then −1', () => {
    expect(cohenKappa(['a', 'b', 'a'], ['a', 'b', 'a']).kappa).toBe(1);
    expect(cohenKappa(['a', 'b', 'a', 'b'], ['b', 'a', 'b', 'a']).kappa).toBe(-1);
  });
  it('when the input cannot give a kappa, then it says why', () => {
    expect(() => cohenKappa(['a'], ['a', 'b'])).toThrow(StudyDataError);
    expect(() => cohenKappa(['a', 'a'], ['a', 'a'])).toThrow('kappa is undefined');
    expect(() => cohenKappaFromTable([[1, 2]])).toThrow('square');
    expect(() => cohenKappaFromTable([[1, -2], [0, 1]])).toThrow('non-negative counts'); // prettier-ignore
  });
});

describe("Fleiss' kappa", () => {
  it('when 14 raters sort 10 subjects into 5 categories (Wikipedia, "Fleiss\' kappa", worked example), then P̄ 0.378, P̄e 0.213, κ 0.210', () => {
    // The table and κ 0.210 as statsmodels' tests quote the page; P̄, P̄e and the p_j as the page
    // prints them, from memory.
    const k = fleissKappaFromCounts([
      [0, 0, 0, 0, 14],
      [0, 2, 6, 4, 2],
      [0, 0, 3, 5, 6],
      [0, 3, 9, 2, 0],
      [2, 2, 8, 1, 1],
      [7, 7, 0, 0, 0],
      [3, 2, 6, 3, 0],
      [2, 5, 3, 2, 2],
      [6, 5, 2, 1, 0],
      [0, 2, 2, 3, 7],
    ]);
    expect(k.observed).toBeCloseTo(0.378, 3);
    expect(k.expected).toBeCloseTo(0.213, 3);
    expect(k.kappa).toBeCloseTo(0.21, 3);
    expect(k.proportions).toEqual([0.143, 0.2, 0.279, 0.15, 0.229].map((p) => expect.closeTo(p, 3)));
  });
  it('when six psychiatrists diagnose 30 patients (Fleiss 1971, Table 1), then κ 0.430 (R irr::kappam.fleiss: 0.4302445, z 17.65183)', () => {
    // Ratings as R's irr package ships them (data set `diagnoses`), quoted in statsmodels'
    // stats/tests/test_inter_rater.py with irr's printout. Categories: 1 depression, 2 personality
    // disorder, 3 schizophrenia, 4 neurosis, 5 other.
    const diagnoses = [
      [4, 4, 4, 4, 4, 4], [2, 2, 2, 5, 5, 5], [2, 3, 3, 3, 3, 5], [5, 5, 5, 5, 5, 5], [2, 2, 2, 4, 4, 4],
      [1, 1, 3, 3, 3, 3], [3, 3, 3, 3, 5, 5], [1, 1, 3, 3, 3, 4], [1, 1, 4, 4, 4, 4], [5, 5, 5, 5, 5, 5],
      [1, 4, 4, 4, 4, 4], [1, 2, 4, 4, 4, 4], [2, 2, 2, 3, 3, 3], [1, 4, 4, 4, 4, 4], [2, 2, 4, 4, 4, 5],
      [3, 3, 3, 3, 3, 5], [1, 1, 1, 4, 5, 5], [1, 1, 1, 1, 1, 2], [2, 2, 4, 4, 4, 4], [1, 3, 3, 5, 5, 5],
      [5, 5, 5, 5, 5, 5], [2, 4, 4, 4, 4, 4], [2, 2, 4, 5, 5, 5], [1, 1, 4, 4, 4, 4], [1, 4, 4, 4, 4, 5],
      [2, 2, 2, 2, 2, 4], [1, 1, 1, 1, 5, 5], [2, 2, 4, 4, 4, 4], [1, 3, 3, 3, 3, 3], [5, 5, 5, 5, 5, 5],
    ]; // prettier-ignore
    const k = fleissKappa(diagnoses.map((row) => row.map(String)));
    expect(k.subjects).toBe(30);
    expect(k.ratersPerSubject).toBe(6);
    expect(k.proportions.map((p) => p * 180)).toEqual([26, 26, 30, 55, 43].map((c) => expect.closeTo(c, 10)));
    expect(k.kappa).toBeCloseTo(0.4302445, 7);
    expect(k.z).toBeCloseTo(17.65183, 4);
  });
  it('when there are two categories, then each category kappa equals the overall kappa (Fleiss 1971)', () => {
    const k = fleissKappaFromCounts([
      [3, 0],
      [2, 1],
      [0, 3],
      [1, 2],
      [3, 0],
    ]);
    expect(k.perCategory[0]).toBeCloseTo(k.kappa, 12);
    expect(k.perCategory[1]).toBeCloseTo(k.kappa, 12);
  });
  it('when subjects are rated different numbers of times, then it refuses', () => {
    expect(() =>
      fleissKappaFromCounts([
        [2, 1],
        [1, 1],
      ]),
    ).toThrow('the same number of times');
    expect(() => fleissKappa([['pass'], ['fail']])).toThrow('at least twice');
  });
});

describe('exact binomial intervals for agreement percentages (Clopper–Pearson)', () => {
  it('when compared with R binom.test, then the bounds agree to 1e-9', () => {
    // R 4.2.2: binom.test(42, 50)$conf.int etc.
    const cases: [number, number, number, number][] = [
      [42, 50, 0.708873693405, 0.928299232817],
      [0, 20, 0, 0.168433470983],
      [20, 20, 0.831566529017, 1],
      [13, 19, 0.434498431154, 0.874239364127],
    ];
    for (const [x, n, lo, hi] of cases) {
      const p = proportion(x, n);
      expect(p.percent).toBeCloseTo((100 * x) / n, 12);
      expect(p.ci95![0]).toBeCloseTo(100 * lo, 7);
      expect(p.ci95![1]).toBeCloseTo(100 * hi, 7);
    }
  });
  it('when there is nothing to count, then there is no percentage', () => {
    expect(proportion(0, 0)).toEqual({ count: 0, of: 0, percent: null, ci95: null });
  });
});
