import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { capability, capabilityIndices, cpkInterval, expectedPpm } from '../../shared/domain/spc/capability.js';
import { normalDraws, seeded } from '../support/spc.js';

describe('capability indices (NIST/SEMATECH e-Handbook §6.1.6)', () => {
  it('when USL 20, LSL 8, μ 16, σ 2, then Cp 1.000, Cpu 0.667, Cpl 1.333, Cpk 0.667 (e-Handbook §6.1.6 example)', () => {
    const c = capabilityIndices(16, 2, { lower: 8, upper: 20 }, 50);
    expect(c.potential).toBeCloseTo(1.0, 3);
    expect(c.upperIndex).toBeCloseTo(0.667, 3);
    expect(c.lowerIndex).toBeCloseTo(1.333, 3);
    expect(c.index).toBeCloseTo(0.667, 3);
  });

  it('when a centred normal process has Cp 1, 4/3, 5/3, 2, then 0.27 %, 64 ppm, 0.6 ppm, 2 ppb fall outside (e-Handbook §6.1.6)', () => {
    const centred = (cp: number) => expectedPpm(0, 1, { lower: -3 * cp, upper: 3 * cp }).total;
    expect(centred(1) / 1e4).toBeCloseTo(0.27, 2);
    // 2Φ(−4) = 63.3 ppm recomputed; the printed "64 ppm" agrees within its rounding
    expect(centred(4 / 3)).toBeCloseTo(63.34, 1);
    expect(Math.abs(centred(4 / 3) - 64)).toBeLessThan(1);
    expect(centred(1.66)).toBeCloseTo(0.6, 1);
    expect(centred(2) * 1000).toBeCloseTo(1.97, 2); // ppb
  });

  it('when the process sits off centre, then the ppm on each side follow Φ from jstat', () => {
    const p = expectedPpm(16, 2, { lower: 8, upper: 20 });
    expect(p.above).toBeCloseTo((1 - jStat.normal.cdf(20, 16, 2)) * 1e6, 4); // 22 750 ppm, 2σ above
    expect(p.below).toBeCloseTo(jStat.normal.cdf(8, 16, 2) * 1e6, 6);
    expect(p.total).toBeCloseTo(p.above + p.below, 9);
  });

  it('when the tolerance is one-sided, then there is no Cp, Cpk is the one side, and nothing is expected beyond the missing limit', () => {
    const upperOnly = capabilityIndices(16, 2, { lower: null, upper: 20 }, 30);
    expect(upperOnly.potential).toBeNull();
    expect(upperOnly.lowerIndex).toBeNull();
    expect(upperOnly.index).toBeCloseTo(0.667, 3);
    expect(upperOnly.ppm.below).toBe(0);
    const lowerOnly = capabilityIndices(16, 2, { lower: 8, upper: null }, 30);
    expect(lowerOnly.index).toBeCloseTo(1.333, 3);
    expect(lowerOnly.ppm.above).toBe(0);
  });
});

describe('confidence interval on Cpk (Bissell 1990, as in e-Handbook §6.1.6)', () => {
  it('when Cpk 1.33 comes from 20 readings, then the 95 % interval is 0.88 to 1.78 (Montgomery’s worked example, from memory; recomputed)', () => {
    const i = cpkInterval(1.33, 20, 0.95);
    expect(i.lower).toBeCloseTo(0.88, 2);
    expect(i.upper).toBeCloseTo(1.78, 2);
  });

  it('when the interval is built, then its half-width is z·√(1/(9n) + Cpk²/(2(n−1))) with z from jstat', () => {
    const i = cpkInterval(0.667, 50, 0.9);
    const half = jStat.normal.inv(0.95, 0, 1) * Math.sqrt(1 / 450 + 0.667 ** 2 / 98);
    expect(i.upper - 0.667).toBeCloseTo(half, 10);
    expect(0.667 - i.lower).toBeCloseTo(half, 10);
  });

  it('when the sample is tiny or the confidence impossible, then the interval is refused', () => {
    expect(() => cpkInterval(1, 1)).toThrow(RangeError);
    expect(() => cpkInterval(1, 20, 1)).toThrow(RangeError);
  });
});

describe('capability of readings', () => {
  const values = normalDraws(seeded(61), 125, 4.03, 0.0002);
  const spec = { lower: 4.0295, upper: 4.0305 };

  it('when readings are given, then Pp and Ppk use their sample standard deviation (cross-checked with jstat)', () => {
    const c = capability(values, spec);
    const sd = jStat.stdev(values, true);
    const mu = jStat.mean(values);
    expect(c.mean).toBeCloseTo(mu, 12);
    expect(c.overall!.sigma).toBeCloseTo(sd, 12);
    expect(c.overall!.potential).toBeCloseTo((4.0305 - 4.0295) / (6 * sd), 9);
    expect(c.overall!.index).toBeCloseTo(Math.min(4.0305 - mu, mu - 4.0295) / (3 * sd), 9);
    expect(c.within).toBeNull();
  });

  it('when a within σ is given, then Cp and Cpk use it and Pp, Ppk still use the overall σ', () => {
    const c = capability(values, spec, { sigmaWithin: 0.00015 });
    expect(c.within!.sigma).toBe(0.00015);
    expect(c.within!.potential).toBeCloseTo(0.001 / 0.0009, 9);
    expect(c.overall!.sigma).toBeCloseTo(jStat.stdev(values, true), 12);
  });

  it('when the tolerance or readings are unusable, then capability is refused or left out', () => {
    expect(() => capability(values, { lower: null, upper: null })).toThrow(/specification limit/);
    expect(() => capability(values, { lower: 5, upper: 4 })).toThrow(/below the upper/);
    expect(() => capability([4.03], spec)).toThrow(/two readings/);
    expect(() => capability(values, spec, { sigmaWithin: -1 })).toThrow(RangeError);
    expect(capability([4.03, 4.03, 4.03], spec).overall).toBeNull();
  });
});
