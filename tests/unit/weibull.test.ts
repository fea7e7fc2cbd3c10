import { jStat } from 'jstat';
import { describe, expect, it } from 'vitest';
import {
  bLife,
  bernard,
  fittedLine,
  medianRankRegression,
  probabilityPlot,
  weibullCdf,
} from '../../shared/domain/weibull.js';
import { FANS } from './fixtures/nelson-fans.js';

// Regression references: R 4.2.2 (Debian r-base-core), lm() on the same plotting positions, with
// Johnson's ranks computed in R by a separate loop (not this code); its printout is pasted beside
// each check. The R script is in docs/statistics-msa-weibull.md.

describe("Bernard's median ranks", () => {
  it('when n = 10, then (i − 0.3)/10.4 gives 6.73 % … 93.27 % (formula)', () => {
    expect(bernard(1, 10)).toBeCloseTo(0.0673, 4);
    expect(bernard(5, 10)).toBeCloseTo(0.4519, 4);
    expect(bernard(10, 10)).toBeCloseTo(0.9327, 4);
  });
  it('when compared with exact median ranks (the median of Beta(i, n − i + 1), jstat), then within 0.002 for n = 10', () => {
    for (let i = 1; i <= 10; i++) {
      expect(Math.abs(bernard(i, 10) - jStat.beta.inv(0.5, i, 11 - i))).toBeLessThan(0.002);
    }
  });
});

describe("Johnson's adjusted ranks with suspensions", () => {
  // weibull.com Reliability HotWire issue 104 (October 2009), "Median Rank Based on Mean Order
  // Number", Table 1: S 2,500, F 2,730, F 3,900, S 4,100, F 5,000 hours. The article finds each
  // failure's mean order number by counting the orders the suspended units could have failed in
  // (S1 could have failed in any of 5 places, one of them before F1: F1 is 1st or 2nd, mean 1.2).
  // The figures below are recomputed by hand with Johnson's formula, not copied from the article:
  // 6/5 = 1.2; (3 × 1.2 + 6)/4 = 2.4; (1 × 2.4 + 6)/2 = 4.2.
  const data = [
    { time: 2500, failed: false },
    { time: 2730, failed: true },
    { time: 3900, failed: true },
    { time: 4100, failed: false },
    { time: 5000, failed: true },
  ];
  it('when the five items are ranked, then the failures get 1.2, 2.4 and 4.2', () => {
    expect(probabilityPlot(data).map((p) => p.adjustedRank)).toEqual([1.2, 2.4, 4.2].map((r) => expect.closeTo(r, 12)));
  });
  it("when Bernard's approximation is applied, then F = 0.1667, 0.3889, 0.7222 (R: 0.166666666667 0.388888888889 0.722222222222)", () => {
    const points = probabilityPlot(data);
    expect(points.map((p) => p.medianRank)).toEqual(
      [0.9 / 5.4, 2.1 / 5.4, 3.9 / 5.4].map((f) => expect.closeTo(f, 12)),
    );
    expect(points[0]!.x).toBeCloseTo(Math.log(2730), 12);
    expect(points[0]!.y).toBeCloseTo(Math.log(-Math.log(1 - 0.9 / 5.4)), 12);
  });
  it('when the records come unsorted, then the ranks are the same', () => {
    expect(probabilityPlot([...data].reverse()).map((p) => p.adjustedRank)).toEqual(
      probabilityPlot(data).map((p) => p.adjustedRank),
    );
  });
  it('when nothing is suspended, then the adjusted ranks are 1, 2, 3 …', () => {
    const complete = [5, 3, 9, 1].map((time) => ({ time, failed: true }));
    expect(probabilityPlot(complete).map((p) => p.adjustedRank)).toEqual([1, 2, 3, 4]);
  });
  it("when Nelson's 70 fans are ranked (12 failures), then the ranks match R's loop: 1, 2.01449, 3.02899 … 19.90772", () => {
    // R: 1 2.01449275362 3.02898550725 4.0588493632 5.25422705314 6.44960474308 7.64498243303
    //    8.96487863234 10.3134682273 12.0473691351 14.2307999079 19.9077199171
    const r = [
      1, 2.01449275362, 3.02898550725, 4.0588493632, 5.25422705314, 6.44960474308, 7.64498243303, 8.96487863234,
      10.3134682273, 12.0473691351, 14.2307999079, 19.9077199171,
    ];
    expect(probabilityPlot(FANS).map((p) => p.adjustedRank)).toEqual(r.map((x) => expect.closeTo(x, 9)));
  });
  it('when identical units are given as one record with a count, then the ranks are those of the units one by one', () => {
    const grouped = new Map<string, { time: number; failed: boolean; count: number }>();
    for (const f of FANS) {
      const key = `${f.time}:${f.failed}`;
      const g = grouped.get(key) ?? { ...f, count: 0 };
      g.count++;
      grouped.set(key, g);
    }
    expect(grouped.size).toBeLessThan(FANS.length);
    expect(probabilityPlot([...grouped.values()])).toEqual(probabilityPlot(FANS));
  });
});

describe('median-rank regression', () => {
  it('when the HotWire data are fitted X on Y, then β 3.21839, η 4706.29, R² 0.991616 (R lm(x ~ y))', () => {
    const fit = medianRankRegression([
      { time: 2500, failed: false },
      { time: 2730, failed: true },
      { time: 3900, failed: true },
      { time: 4100, failed: false },
      { time: 5000, failed: true },
    ]);
    expect(fit.shape).toBeCloseTo(3.21839430865, 9);
    expect(fit.scale).toBeCloseTo(4706.28714975, 6);
    expect(fit.rSquared).toBeCloseTo(0.99161585981, 10);
    expect(fit).toMatchObject({ regression: 'x-on-y', failures: 3, suspensions: 2 });
  });
  it("when Nelson's fans are fitted, then X on Y gives β 1.25115, η 16.868 and Y on X β 1.19188, η 18.624 (R lm)", () => {
    const xy = medianRankRegression(FANS);
    expect(xy.shape).toBeCloseTo(1.25115080082, 9);
    expect(xy.scale).toBeCloseTo(16.8680295648, 8);
    expect(xy.rSquared).toBeCloseTo(0.952624899095, 10);
    const yx = medianRankRegression(FANS, { regression: 'y-on-x' });
    expect(yx.shape).toBeCloseTo(1.19187740539, 9);
    expect(yx.scale).toBeCloseTo(18.6238025035, 8);
  });
  it('when the data lie exactly on a Weibull line, then the fit returns that line', () => {
    // Times placed at the Bernard median ranks of β 2, η 100: t = η (−ln(1 − F))^(1/β).
    const n = 8;
    const data = Array.from({ length: n }, (_, i) => ({
      time: 100 * (-Math.log(1 - bernard(i + 1, n))) ** 0.5,
      failed: true,
    }));
    const fit = medianRankRegression(data);
    expect(fit.shape).toBeCloseTo(2, 10);
    expect(fit.scale).toBeCloseTo(100, 8);
    expect(fit.rSquared).toBeCloseTo(1, 12);
  });
  it('when there are fewer than 2 failures, or all at one time, then it refuses in words', () => {
    expect(() => medianRankRegression([{ time: 5, failed: true }, { time: 9, failed: false }])).toThrow('at least 2 failures'); // prettier-ignore
    expect(() => medianRankRegression([{ time: 5, failed: true }, { time: 5, failed: true }])).toThrow('all failures are at one time'); // prettier-ignore
  });
  it('when a record is not usable, then the message names it', () => {
    expect(() => probabilityPlot([{ time: 0, failed: true }])).toThrow(
      'record 1: the time must be a number greater than zero',
    );
    expect(() => probabilityPlot([{ time: 3, failed: true, count: 1.5 }])).toThrow('record 1: the count');
    expect(() => probabilityPlot([{ time: 3, failed: 'yes' as unknown as boolean }])).toThrow('record 1: say whether');
  });
});

describe('the distribution, B lives and the fitted line', () => {
  const params = { shape: 1.05844585, scale: 26.29684517 };
  it("when B10 and B1 are asked of the fans' ML fit, then 3.13724 and 0.340723 (R qweibull)", () => {
    expect(bLife(0.1, params)).toBeCloseTo(3.13724077767, 9);
    expect(bLife(0.01, params)).toBeCloseTo(0.340722587604, 10);
  });
  it('when the B10 life is put back in the cdf (and in jstat.weibull.cdf), then 10 % have failed', () => {
    const b10 = bLife(0.1, params);
    expect(weibullCdf(b10, params)).toBeCloseTo(0.1, 14);
    expect(jStat.weibull.cdf(b10, params.scale, params.shape)).toBeCloseTo(0.1, 12);
  });
  it('when t = η, then 63.2 % have failed whatever the shape (1 − 1/e)', () => {
    expect(weibullCdf(26.29684517, params)).toBeCloseTo(1 - Math.exp(-1), 14);
    expect(weibullCdf(0, params)).toBe(0);
  });
  it('when the fitted line is drawn, then its points are on y = β(x − ln η) and run from the first time to the last', () => {
    const line = fittedLine(params, 0.5, 50, 10);
    expect(line).toHaveLength(11);
    expect(line[0]!.time).toBeCloseTo(0.5, 12);
    expect(line[10]!.time).toBeCloseTo(50, 10);
    for (const p of line) {
      expect(p.y).toBeCloseTo(params.shape * (p.x - Math.log(params.scale)), 12);
      expect(p.fractionFailed).toBeCloseTo(weibullCdf(p.time, params), 12);
    }
  });
  it('when the fraction or parameters make no sense, then it refuses', () => {
    expect(() => bLife(10, params)).toThrow('between 0 and 1');
    expect(() => weibullCdf(1, { shape: 0, scale: 1 })).toThrow('positive shape and scale');
    expect(() => fittedLine(params, 5, 1)).toThrow('0 < from < to');
  });
});
