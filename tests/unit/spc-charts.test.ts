import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { individualsChart, partMeansChart, xbarRChart, xbarSChart } from '../../shared/domain/spc/charts.js';
import { sigmaWithin, type Subgroup } from '../../shared/domain/spc/limits.js';
import { range } from '../../shared/domain/spc/summary.js';
import { normalDraws, seeded } from '../support/spc.js';

// NIST/SEMATECH e-Handbook §6.3.2.2, "Example of moving range": flow rate of the first 10 batches.
const FLOW = [49.6, 47.6, 49.9, 51.3, 47.8, 51.2, 52.6, 52.4, 53.6, 52.1];
const batches = (values: number[]) => values.map((value, i) => ({ key: `batch ${i + 1}`, value }));

describe('individuals and moving range (e-Handbook §6.3.2.2 worked example)', () => {
  const c = individualsChart(batches(FLOW));

  it('when the ten batches are charted, then x̄, MR̄ and the limits are the printed 50.81, 1.8778, 55.8041 and 45.8159', () => {
    expect(c.limits.mean).toBeCloseTo(50.81, 2);
    expect(c.limits.mrBar).toBeCloseTo(1.8778, 4);
    expect(c.individuals.upper).toBeCloseTo(55.8041, 4);
    expect(c.individuals.lower).toBeCloseTo(45.8159, 4);
    expect(c.individuals.centre).toBeCloseTo(50.81, 2);
  });

  it('when the moving ranges are read, then they are the printed 2.0, 2.3, 1.4, 3.5, 3.4, 1.4, 0.2, 1.2, 1.5, each under its later batch', () => {
    const mr = c.movingRange.points.map((p) => Number(p.value.toFixed(1)));
    expect(mr).toEqual([2.0, 2.3, 1.4, 3.5, 3.4, 1.4, 0.2, 1.2, 1.5]);
    expect(c.movingRange.points[0]).toMatchObject({ index: 1, key: 'batch 2' });
    // UCL of MR = D4(2)·MR̄ = 3.267 × 16.9/9 = 6.1347 (e-Handbook §6.3.2.2 formula; product recomputed)
    expect(c.movingRange.upper).toBeCloseTo(6.1347, 4);
    expect(c.movingRange.lower).toBe(0);
  });

  it('when nothing crosses a limit, then no point is flagged ("the process is in control", as the e-Handbook concludes)', () => {
    expect(c.individuals.signals).toEqual([]);
    expect(c.movingRange.signals).toEqual([]);
    expect(c.sigmaWithin).toBeCloseTo(1.8778 / 1.128, 4);
  });
});

// Four subgroups of three, worked by hand: means 11, 12, 10, 12 → x̿ = 11.25; every range 2 → R̄ = 2;
// every s = 1 → s̄ = 1.
const HAND: Subgroup[] = [
  { key: 'A', values: [10, 12, 11] },
  { key: 'B', values: [11, 13, 12] },
  { key: 'C', values: [9, 10, 11] },
  { key: 'D', values: [12, 11, 13] },
];

describe('X̄–R and X̄–S limits (e-Handbook §6.3.2.1 formulas, worked by hand)', () => {
  it('when subgroups of 3 have x̿ 11.25 and R̄ 2, then X̄ is 11.25 ± 1.023·2 and R runs 0 to 2.574·2', () => {
    const c = xbarRChart(HAND);
    expect(c.xbar.centre).toBeCloseTo(11.25, 10);
    expect(c.xbar.upper).toBeCloseTo(13.296, 3);
    expect(c.xbar.lower).toBeCloseTo(9.204, 3);
    expect(c.range.centre).toBe(2);
    expect(Math.abs(c.range.upper - 5.15)).toBeLessThanOrEqual(0.002 + 1e-12); // D4 2.574/2.575: published tables differ in the last digit (ASTM E2587, e-Handbook §6.3.2)
    expect(c.range.lower).toBe(0);
    expect(c.sigmaWithin).toBeCloseTo(2 / 1.693, 6); // R̄/d2
  });

  it('when the same subgroups go on an X̄–S chart, then X̄ is 11.25 ± 1.954 and s runs 0 to 2.568', () => {
    const c = xbarSChart(HAND);
    expect(c.limits.sBar).toBeCloseTo(1, 12);
    expect(c.xbar.upper).toBeCloseTo(13.204, 3);
    expect(c.xbar.lower).toBeCloseTo(9.296, 3);
    expect(c.s.upper).toBeCloseTo(2.568, 3);
    expect(c.s.lower).toBe(0);
    expect(c.sigmaWithin).toBeCloseTo(1 / 0.8862, 4); // s̄/c4
  });

  it('when R̄ is 4.652 for subgroups of 5, then σ within is 2.000 (derived: R̄/d2 with d2(5) = 2.326, ASTM E2587)', () => {
    expect(sigmaWithin({ method: 'xbar-r', n: 5, baselineCount: 20, grandMean: 16, rBar: 4.652 })).toBeCloseTo(2, 3);
  });

  it('when subgroup means, ranges and s are cross-checked, then they equal jstat’s mean, range and sample stdev', () => {
    const r = xbarRChart(HAND);
    const s = xbarSChart(HAND);
    HAND.forEach((g, i) => {
      expect(r.xbar.points[i]!.value).toBeCloseTo(jStat.mean([...g.values]), 12);
      expect(r.range.points[i]!.value).toBeCloseTo(jStat.range([...g.values]), 12);
      expect(s.s.points[i]!.value).toBeCloseTo(jStat.stdev([...g.values], true), 12);
    });
  });
});

describe('baseline and frozen limits', () => {
  const random = seeded(19);
  const subgroups: Subgroup[] = Array.from({ length: 15 }, (_, i) => ({
    key: `g${i}`,
    // the last five subgroups come from a process moved up by 3σ
    values: normalDraws(random, 4, i < 10 ? 100 : 103, 1),
  }));

  it('when the baseline is the first ten subgroups, then the limits come from them alone and the shifted subgroups are flagged', () => {
    const c = xbarRChart(subgroups, { baseline: { from: 0, to: 9 } });
    const first10 = xbarRChart(subgroups.slice(0, 10));
    expect(c.limits).toEqual(first10.limits);
    expect(c.limits.baselineCount).toBe(10);
    expect(c.xbar.points.map((p) => p.inBaseline)).toEqual([...Array(10).fill(true), ...Array(5).fill(false)]);
    const flagged = new Set(c.xbar.signals.map((s) => s.index));
    for (const i of [10, 11, 12, 13, 14]) expect(flagged.has(i)).toBe(true);
  });

  it('when the limits are frozen and later subgroups charted, then the lines do not move with the new points', () => {
    const frozen = xbarRChart(subgroups, { baseline: { from: 0, to: 9 } }).limits;
    const later = xbarRChart(subgroups.slice(10), { limits: frozen });
    const base = xbarRChart(subgroups.slice(0, 10));
    expect(later.xbar.upper).toBe(base.xbar.upper);
    expect(later.range.upper).toBe(base.range.upper);
    expect(later.xbar.points.every((p) => !p.inBaseline)).toBe(true);
    // the same subgroups with limits of their own hide the shift
    expect(xbarRChart(subgroups.slice(10)).xbar.signals.filter((s) => s.rule === 1)).toEqual([]);
  });

  it('when an individuals baseline ends mid-series, then the moving range across the boundary is not in the baseline', () => {
    const c = individualsChart(batches(FLOW), { baseline: { from: 0, to: 4 } });
    expect(c.limits.baselineCount).toBe(5);
    expect(c.limits.mrBar).toBeCloseTo((2.0 + 2.3 + 1.4 + 3.5) / 4, 10);
    expect(c.movingRange.points.map((p) => p.inBaseline)).toEqual([
      true,
      true,
      true,
      true,
      false,
      false,
      false,
      false,
      false,
    ]);
  });

  it('when the input does not fit, then it is refused with a RangeError naming the problem', () => {
    const frozen = xbarRChart(HAND).limits;
    expect(() => xbarRChart([...HAND, { key: 'E', values: [1, 2] }])).toThrow(/same size/);
    expect(() =>
      xbarRChart(
        [{ key: 'A', values: [1, 2, 3, 4] }, ...HAND.slice(1).map((g) => ({ ...g, values: [...g.values, 1] }))],
        { limits: frozen },
      ),
    ).toThrow(/subgroups of 3/);
    expect(() => individualsChart(batches(FLOW), { limits: frozen as never })).toThrow(/xbar-r chart/);
    expect(() => xbarRChart(HAND, { baseline: { from: 2, to: 9 } })).toThrow(/baseline/);
    expect(() => xbarRChart(HAND, { limits: { ...frozen, rBar: undefined as never } })).toThrow(/not a number/);
    expect(() => xbarRChart(HAND, { baseline: { from: 1, to: 1 } })).toThrow(/at least two/);
    expect(() => individualsChart(batches([1, Number.NaN, 2]))).toThrow(/finite/);
    expect(() =>
      xbarRChart(HAND.map((g) => ({ ...g, values: [...g.values, ...g.values, ...g.values, 1, 2] }))),
    ).toThrow(/2 to 10/);
  });
});

describe('part means and within-part range (many positions on one part)', () => {
  // 24 blocks, 4 bores each: blocks differ by σ 0.3, bores within a block by σ 0.1
  const random = seeded(7);
  const parts: Subgroup[] = Array.from({ length: 24 }, (_, i) => {
    const [offset] = normalDraws(random, 1, 0, 0.3);
    return { key: `block ${i}`, values: normalDraws(random, 4, 4 + offset!, 0.1) };
  });

  it('when the bores are charted as X̄ subgroups, then the limits are too tight and many in-control blocks are flagged', () => {
    const wrong = xbarRChart(parts);
    expect(wrong.xbar.signals.filter((s) => s.rule === 1).length).toBeGreaterThan(5);
  });

  it('when the part means are charted as individuals, then no block crosses a limit and the within chart uses ranges of 4', () => {
    const c = partMeansChart(parts);
    expect(c.means.signals.filter((s) => s.rule === 1)).toEqual([]);
    expect(c.within.kind).toBe('within-range');
    expect(c.within.points).toHaveLength(24);
    expect(c.movingRange.points).toHaveLength(23);
  });

  it('when σ is estimated, then within-part σ is near 0.1 and one reading’s σ near √(0.3² + 0.1²) = 0.316 (simulation, ±25 %)', () => {
    const c = partMeansChart(parts);
    expect(c.sigmaWithinPart).toBeGreaterThan(0.075);
    expect(c.sigmaWithinPart).toBeLessThan(0.125);
    expect(c.sigmaWithin).toBeGreaterThan(0.237);
    expect(c.sigmaWithin).toBeLessThan(0.395);
  });

  it('when a part has more than ten positions, then the within chart is an s chart', () => {
    const many = parts.map((p) => ({ key: p.key, values: [...p.values, ...p.values, ...p.values] }));
    const c = partMeansChart(many);
    expect(c.within.kind).toBe('within-s');
    expect(c.limits.within).toBe('s');
  });
});

describe('a year of readings', () => {
  it('when the range of 200 000 readings is taken, then it does not overflow the call stack (Math.max(...values) would)', () => {
    const random = seeded(365);
    const values = Array.from({ length: 200_000 }, () => 4.03 + random() / 1000);
    values[123_456] = 4.1;
    values[7] = 4.0;
    expect(range(values)).toBeCloseTo(0.1, 12); // largest 4.1 − smallest 4.0, set by hand
  });
});
