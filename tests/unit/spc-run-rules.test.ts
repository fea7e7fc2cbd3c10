import { describe, expect, it } from 'vitest';
import { individualsChart } from '../../shared/domain/spc/charts.js';
import { runRuleFlags, type RunRule, type Zones } from '../../shared/domain/spc/run-rules.js';

// Constructed series on a chart with centre 0 and σ 1, so each value is its own z. Each series
// breaks one Western Electric rule (as listed in the e-Handbook §6.3.2) exactly once; signs
// alternate elsewhere so that no run of eight forms by accident.
const Z: Zones = { centre: 0, sigma: 1, lower: -3, upper: 3 };

const flagged = (values: number[]) =>
  runRuleFlags(values, Z)
    .map((rules, index) => ({ index, rules }))
    .filter((p) => p.rules.length > 0);

const CASES: { rule: RunRule; series: number[]; at: number }[] = [
  // rule 1: one point beyond 3σ
  { rule: 1, series: [0.5, -0.5, 0.3, 3.4, -0.2, 0.4, -0.6, 0.1, -0.3, 0.2], at: 3 },
  // rule 2: two of three beyond 2σ on the same side (2.5, 0.5, 2.6)
  { rule: 2, series: [0.3, -0.4, 2.5, 0.5, 2.6, -0.2, 0.4, -0.5, 0.1, -0.1], at: 4 },
  // rule 3: four of five beyond 1σ on the same side (1.5, 1.2, 0.4, 1.8, 1.3)
  { rule: 3, series: [0.2, -0.6, 1.5, 1.2, 0.4, 1.8, 1.3, -0.4, 0.3, -0.2], at: 6 },
  // rule 4: eight in a row on one side, all within 1σ
  { rule: 4, series: [-0.5, 0.3, 0.5, 0.2, 0.8, 0.1, 0.6, 0.4, 0.7, -0.3, 0.2], at: 8 },
];

describe('Western Electric run rules', () => {
  it.each(CASES)(
    'when a series breaks rule $rule once, then exactly one point is flagged, with that rule alone',
    ({ rule, series, at }) => {
      expect(flagged(series)).toEqual([{ index: at, rules: [rule] }]);
    },
  );

  it('when the same series are negated, then each is flagged at the same point (the rules are symmetric)', () => {
    for (const { rule, series, at } of CASES)
      expect(flagged(series.map((v) => -v))).toEqual([{ index: at, rules: [rule] }]);
  });

  it('when the points of a pattern lie on opposite sides, then rules 2, 3 and 4 stay silent', () => {
    expect(flagged([2.5, -2.6, 0.1, 1.5, -1.2, 1.4, -1.3, 0.2])).toEqual([]);
  });

  it('when a point lies exactly on a limit or zone line, then it is not beyond it; a point on the centre breaks a run', () => {
    expect(flagged([3, -3, 0.1, 2, 2, -0.2, 1, 1, 1, 1])).toEqual([]);
    expect(flagged([0.1, 0.2, 0.3, 0.4, 0, 0.5, 0.6, 0.7, 0.8, -0.1])).toEqual([]);
  });

  it('when a run is longer than eight, then every point past the eighth is flagged (the run goes on)', () => {
    const series = [-0.5, ...Array(10).fill(0.4), -0.5];
    expect(flagged(series).map((p) => p.index)).toEqual([8, 9, 10]);
  });

  it('when only some rules are asked for, then the others are not flagged', () => {
    const { series, at } = CASES[3]!;
    expect(runRuleFlags(series, Z, [1, 2, 3])[at]).toEqual([]);
  });

  it('when σ is zero, then any point off the centre is beyond every zone (readings that never varied)', () => {
    expect(runRuleFlags([5, 5, 5.1], { centre: 5, sigma: 0, lower: 5, upper: 5 })[2]).toEqual([1]);
    expect(() => runRuleFlags([1], { centre: 0, sigma: -1, lower: -3, upper: 3 })).toThrow(RangeError);
  });

  it('when a chart is built, then the location chart carries all four rules and its signals list names the key', () => {
    // individuals chart of the rule 1 series around a baseline whose limits sit near ±3
    const base = [0.5, -0.5, 0.3, -0.4, 0.6, -0.6, 0.2, -0.3, 0.4, -0.2];
    const points = [...base, 9, -0.1].map((value, i) => ({ key: `p${i}`, value }));
    const c = individualsChart(points, { baseline: { from: 0, to: 9 } });
    expect(c.individuals.rules).toEqual([1, 2, 3, 4]);
    expect(c.movingRange.rules).toEqual([1]);
    expect(c.individuals.signals).toEqual([{ index: 10, key: 'p10', rule: 1 }]);
    expect(c.individuals.points[10]!.flags).toEqual([1]);
  });
});
