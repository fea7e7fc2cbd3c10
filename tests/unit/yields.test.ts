import { describe, expect, it } from 'vitest';
import { fpy, paretoOrder, rty } from '../../shared/domain/yields.js';

describe('first-pass and rolled throughput yield', () => {
  it('when four steps have hand-counted first passes, then RTY is the product of their FPYs', () => {
    // common practice (FPY and RTY by their common definitions): 0.85 × 0.8889 × 0.8125 × 0.8267 = 0.5075;
    // counts chosen so each FPY is that value: 85/100, 80/90, 65/80, 62/75
    const steps = [
      { entered: 100, firstPass: 85 },
      { entered: 90, firstPass: 80 },
      { entered: 80, firstPass: 65 },
      { entered: 75, firstPass: 62 },
    ];
    expect(steps.map((s) => fpy(s)!.toFixed(4))).toEqual(['0.8500', '0.8889', '0.8125', '0.8267']);
    expect(rty(steps)).toBeCloseTo(0.5075, 4);
  });

  it('when a step had no entries, then it carries no evidence and is left out; none at all gives no RTY', () => {
    expect(fpy({ entered: 0, firstPass: 0 })).toBeNull();
    expect(
      rty([
        { entered: 4, firstPass: 3 },
        { entered: 0, firstPass: 0 },
      ]),
    ).toBe(0.75);
    expect(rty([])).toBeNull();
  });

  it('when counts are impossible, then they are refused rather than turned into a yield over 100 %', () => {
    expect(() => fpy({ entered: 3, firstPass: 4 })).toThrow(RangeError);
    expect(() => fpy({ entered: -1, firstPass: 0 })).toThrow(RangeError);
    expect(() => fpy({ entered: 2.5, firstPass: 1 })).toThrow(RangeError);
  });
});

describe('Pareto order', () => {
  it('when counts are 1, 4 and 2, then they come most first with cumulative shares of 57.1, 85.7 and 100 %', () => {
    // by hand: 4/7 = 57.14 %, 6/7 = 85.71 %, 7/7 = 100 %
    const rows = paretoOrder([
      { key: 'LEAK', count: 1 },
      { key: 'OOT', count: 4 },
      { key: 'CRK', count: 2 },
    ]);
    expect(rows.map((r) => [r.key, r.cumulativePct])).toEqual([
      ['OOT', 57.1],
      ['CRK', 85.7],
      ['LEAK', 100],
    ]);
  });
});
