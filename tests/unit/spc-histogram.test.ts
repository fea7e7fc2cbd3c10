import { describe, expect, it } from 'vitest';
import { histogram, type Histogram } from '../../shared/domain/spc/histogram.js';
import { normalDraws, seeded } from '../support/spc.js';

// Bore diameter 4.0300 ± 0.0005 in (the tolerance tests' bore rule; illustrative, common practice).
const spec = { lower: 4.0295, upper: 4.0305 };
const total = (h: Histogram) => h.bins.reduce((s, b) => s + b.count, 0);
const binOf = (h: Histogram, v: number) =>
  h.bins.find((b) => b.lower <= v + 1e-12 && v <= b.upper + 1e-12 && b.count > 0);

describe('histogram bins against the tolerance', () => {
  const values = normalDraws(seeded(3), 200, 4.0301, 0.0003);
  const h = histogram(values, spec);

  it('when readings are binned, then both limits fall on bin edges and every reading is counted once', () => {
    expect(h.bins.some((b) => Math.abs(b.lower - spec.lower) < 1e-12)).toBe(true);
    expect(h.bins.some((b) => Math.abs(b.upper - spec.upper) < 1e-12)).toBe(true);
    expect(total(h)).toBe(200);
    expect(h.n).toBe(200);
  });

  it('when bins are labelled, then each is wholly below, within or above the tolerance', () => {
    for (const b of h.bins) {
      if (b.zone === 'below') expect(b.upper).toBeLessThanOrEqual(spec.lower + 1e-12);
      if (b.zone === 'above') expect(b.lower).toBeGreaterThanOrEqual(spec.upper - 1e-12);
      if (b.zone === 'within') {
        expect(b.lower).toBeGreaterThanOrEqual(spec.lower - 1e-12);
        expect(b.upper).toBeLessThanOrEqual(spec.upper + 1e-12);
      }
    }
    // the counts outside equal the readings outside (none of these lie on a limit)
    expect(h.bins.filter((b) => b.zone === 'above').reduce((s, b) => s + b.count, 0)).toBe(
      values.filter((v) => v > 4.0305).length,
    );
    expect(h.bins.filter((b) => b.zone === 'below').reduce((s, b) => s + b.count, 0)).toBe(
      values.filter((v) => v < 4.0295).length,
    );
  });

  it('when a reading lies exactly on a limit, then it is counted inside the tolerance (limits are inclusive, as in tolerance.ts)', () => {
    const onLimits = histogram([4.0295, 4.03, 4.0305, 4.0306], spec, { bins: 4 });
    expect(binOf(onLimits, 4.0305)!.zone).toBe('within');
    expect(onLimits.bins.filter((b) => b.zone === 'within').reduce((s, b) => s + b.count, 0)).toBe(3);
    expect(onLimits.bins.filter((b) => b.zone === 'above').reduce((s, b) => s + b.count, 0)).toBe(1);
  });

  it('when one reading lies far outside, then the bins stay within maxBins and the end bin stretches to reach it', () => {
    const far = histogram([...values, 4.2], spec, { maxBins: 20 });
    expect(far.bins.length).toBeLessThanOrEqual(20);
    const last = far.bins.at(-1)!;
    expect(last).toMatchObject({ upper: 4.2, zone: 'above' });
    expect(last.count).toBeGreaterThanOrEqual(1);
    expect(total(far)).toBe(201);
    expect(far.bins.some((b) => Math.abs(b.upper - spec.upper) < 1e-12)).toBe(true);
    // the tolerance keeps the same fine bins as without the wild reading
    const inside = (x: Histogram) => x.bins.filter((b) => b.zone === 'within').length;
    expect(inside(far)).toBe(inside(h));
    expect(inside(far)).toBeGreaterThan(1);
  });

  it('when the tolerance has one limit, then the bins are anchored on it with a round width', () => {
    const outOfRound = histogram([0.0002, 0.0004, 0.0005, 0.0008, 0.0011, 0.0003], { lower: null, upper: 0.001 });
    expect(
      [1, 2, 5].some((m) => Math.abs(outOfRound.width / 10 ** Math.floor(Math.log10(outOfRound.width)) - m) < 1e-9),
    ).toBe(true);
    expect(outOfRound.bins.some((b) => Math.abs(b.upper - 0.001) < 1e-12)).toBe(true);
    expect(outOfRound.bins.filter((b) => b.zone === 'above').reduce((s, b) => s + b.count, 0)).toBe(1);
    expect(total(outOfRound)).toBe(6);
  });

  it('when 200 000 readings are binned, then every one is counted (no spread of the whole array into a call)', () => {
    const random = seeded(365);
    const year = Array.from({ length: 200_000 }, () => 4.0294 + random() / 1000);
    expect(total(histogram(year, spec))).toBe(200_000);
  });

  it('when the resolution is given, then the width is a whole number of steps and no bin is left empty by the rounding', () => {
    // bores read at 0.0001 in against 4.0295–4.0305 in: ten steps in the tolerance
    const random = seeded(48);
    const rounded = Array.from({ length: 5000 }, () => Number((4.03 + (random() - 0.5) * 0.0008).toFixed(4)));
    const h = histogram(rounded, spec, { resolution: 0.0001 });
    const steps = h.width / 0.0001;
    expect(Math.abs(steps - Math.round(steps))).toBeLessThan(1e-9);
    expect((0.001 / h.width) % 1).toBeCloseTo(0, 9);
    const inside = h.bins.filter((b) => b.lower >= 4.0297 - 1e-12 && b.upper <= 4.0303 + 1e-12);
    expect(inside.every((b) => b.count > 0)).toBe(true);
    expect(total(h)).toBe(5000);
    // without it, widths of a fourteenth of the tolerance leave bins the rounded readings never reach
    const plain = histogram(rounded, spec, { bins: 14 });
    expect(plain.bins.some((b) => b.zone === 'within' && b.count === 0)).toBe(true);
  });

  it('when there is no tolerance or the input is unusable, then bins are all "within" or the call is refused', () => {
    const none = histogram([1, 2, 3, 4, 5], { lower: null, upper: null });
    expect(none.bins.every((b) => b.zone === 'within')).toBe(true);
    expect(total(none)).toBe(5);
    expect(histogram([7, 7, 7], { lower: null, upper: null }).bins).toHaveLength(1);
    expect(() => histogram([], spec)).toThrow(RangeError);
    expect(() => histogram([1], { lower: 2, upper: 1 })).toThrow(RangeError);
    expect(() => histogram([1], spec, { bins: 0 })).toThrow(RangeError);
    expect(() => histogram([1], spec, { maxBins: 3 })).toThrow(RangeError);
  });
});
