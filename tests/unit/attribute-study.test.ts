import { describe, expect, it } from 'vitest';
import { attributeAgreement, attributeBands } from '../../shared/domain/attribute-study.js';

// An invented crack-check study, small enough to count by hand: 3 appraisers, 6 parts, 2 trials.
// Every figure below is counted from this table (derived; the counting is written beside it).
const P = 'pass';
const F = 'fail';
const reference = [P, P, F, F, P, F];
const ratings = [
  // A: consistent and right on every part
  [[P, P], [P, P], [F, F], [F, F], [P, P], [F, F]],
  // B: wavers on part 2, consistently passes the bad part 4
  [[P, P], [P, F], [F, F], [P, P], [P, P], [F, F]],
  // C: consistently fails the good part 1, wavers on the bad part 3
  [[F, F], [P, P], [F, P], [F, F], [P, P], [F, F]],
]; // prettier-ignore

describe('an attribute agreement study with a reference', () => {
  const r = attributeAgreement({ ratings, reference, nonconforming: F });
  const [a, b, c] = r.appraisers as [(typeof r.appraisers)[0], (typeof r.appraisers)[0], (typeof r.appraisers)[0]];

  it('when each appraiser is held to themself, then A agrees on 6 of 6 parts, B and C on 5 of 6', () => {
    expect([a, b, c].map((x) => [x.within.count, x.within.of])).toEqual([
      [6, 6],
      [5, 6],
      [5, 6],
    ]);
    expect(a.withinKappa!.kappa).toBe(1); // every part judged the same twice
  });
  it('when held to the reference, then A 6 of 6, B 4 of 6 (parts 2, 4), C 4 of 6 (parts 1, 3)', () => {
    expect([a, b, c].map((x) => x.vsReference!.count)).toEqual([6, 4, 4]);
    expect(b.vsReference!.percent).toBeCloseTo(66.667, 3);
    expect(b.effectiveness).toMatchObject({ count: 9, of: 12 }); // 2 + 1 + 2 + 0 + 2 + 2 correct decisions
  });
  it("when B's judgements are cross-tabulated with the reference, then p_o 9/12, p_e ½ and Cohen's κ 0.5", () => {
    // B fail/ref fail 4, B fail/ref pass 1, B pass/ref fail 2, B pass/ref pass 5
    expect(b.vsReferenceKappa!.table).toEqual([
      [4, 1],
      [2, 5],
    ]);
    expect(b.vsReferenceKappa!.kappa).toBeCloseTo(0.5, 12);
  });
  it('when misses and false alarms are counted per judgement, then B misses 2 of 6 bad and C raises 2 false alarms of 6 good', () => {
    expect(b.misses).toMatchObject({ count: 2, of: 6 }); // part 4 passed twice
    expect(b.falseAlarms).toMatchObject({ count: 1, of: 6 }); // part 2, trial 2
    expect(c.misses).toMatchObject({ count: 1, of: 6 }); // part 3, trial 2
    expect(c.falseAlarms).toMatchObject({ count: 2, of: 6 }); // part 1 failed twice
    expect(a.misses).toMatchObject({ count: 0, of: 6 });
    expect(a.misses!.ci95![1]).toBeCloseTo(100 * (1 - 0.025 ** (1 / 6)), 6); // exact bound for 0 of 6
  });
  it('when everyone is taken together, then only parts 5 and 6 see one answer from all six judgements', () => {
    expect(r.between).toMatchObject({ count: 2, of: 6 });
    expect(r.allVsReference).toMatchObject({ count: 2, of: 6 });
  });
  it("when all six judgements per part are raters, then Fleiss' κ = (128/180 − ½)/(½) = 0.4222", () => {
    // counts [fail, pass] per part: [2,4] [1,5] [5,1] [4,2] [0,6] [6,0]; p_fail = 18/36
    expect(r.overallKappa!.observed).toBeCloseTo(128 / 180, 12);
    expect(r.overallKappa!.kappa).toBeCloseTo(0.42222, 5);
  });
  it('when appraisers are paired trial by trial, then A and B give κ 0.5', () => {
    expect(r.pairs.map((p) => [p.first, p.second])).toEqual([
      [0, 1],
      [0, 2],
      [1, 2],
    ]);
    expect(r.pairs[0]!.kappa!.kappa).toBeCloseTo(0.5, 12); // same cross-table as B against the reference
  });
});

describe('an attribute study without a reference', () => {
  it('when no reference is given, then only agreement within and between appraisers is reported', () => {
    const r = attributeAgreement({ ratings });
    expect(r.appraisers[0]!.vsReference).toBeNull();
    expect(r.appraisers[0]!.misses).toBeNull();
    expect(r.allVsReference).toBeNull();
    expect(r.between.count).toBe(2);
  });
  it('when every judgement is "pass", then agreement is total and kappa is reported as absent, not as an error', () => {
    const allPass = ratings.map((ps) => ps.map((ts) => ts.map(() => P)));
    const r = attributeAgreement({ ratings: allPass });
    expect(r.between).toMatchObject({ count: 6, of: 6 });
    expect(r.overallKappa).toBeNull();
    expect(r.appraisers[0]!.withinKappa).toBeNull();
  });
});

describe('bad studies are refused', () => {
  it('when a judgement is missing or blank, then it names the appraiser and part', () => {
    const holed = ratings.map((ps, i) => ps.map((ts, p) => (i === 1 && p === 2 ? [ts[0]!, ''] : ts)));
    expect(() => attributeAgreement({ ratings: holed })).toThrow('appraiser 2, part 3 needs 2 judgements');
  });
  it('when the reference does not cover every part, or a nonconforming category comes without one, then it says so', () => {
    expect(() => attributeAgreement({ ratings, reference: [P, F] })).toThrow('the reference gives 2 parts, not 6');
    expect(() => attributeAgreement({ ratings, nonconforming: F })).toThrow('need the reference');
  });
  it('when a part is judged once only, then it asks for two', () => {
    expect(() => attributeAgreement({ ratings: [[[P], [F]]] })).toThrow('at least twice');
  });
});

describe('guideline bands (AIAG MSA 4th ed., from memory)', () => {
  it('when kappa is 0.76, 0.75, 0.40 and 0.39, then acceptable, conditional, conditional, unacceptable', () => {
    expect([0.76, 0.75, 0.4, 0.39].map(attributeBands.kappa)).toEqual([
      'acceptable',
      'conditional',
      'conditional',
      'unacceptable',
    ]);
  });
  it('when the miss rate is 2 %, 5 % and 5.1 %, then acceptable, conditional, unacceptable', () => {
    expect([2, 5, 5.1].map(attributeBands.missRate)).toEqual(['acceptable', 'conditional', 'unacceptable']);
    expect([5, 10, 10.1].map(attributeBands.falseAlarmRate)).toEqual(['acceptable', 'conditional', 'unacceptable']);
    expect([90, 80, 79.9].map(attributeBands.effectiveness)).toEqual(['acceptable', 'conditional', 'unacceptable']);
  });
});
