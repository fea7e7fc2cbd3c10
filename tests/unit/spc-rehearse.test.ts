import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { partMeansChart } from '../../shared/domain/spc/charts.js';
import { rehearseParts, rehearseRule, type PartColumns, type StoredReading } from '../../shared/domain/spc/rehearse.js';
import type { ToleranceRule } from '../../shared/domain/tolerance.js';

// Bore diameter 4.0300 ± 0.0005 in at 0.0001 in resolution (the tolerance tests' bore rule; illustrative).
const current: ToleranceRule = {
  limitType: 'nominal',
  nominal: 4.03,
  minusTol: 0.0005,
  plusTol: 0.0005,
  resolution: 0.0001,
  unit: 'in',
};
const tighter: ToleranceRule = { ...current, minusTol: 0.0004, plusTol: 0.0004 };
const looser: ToleranceRule = { ...current, minusTol: 0.0006, plusTol: 0.0006 };

const bores = (partId: string, values: number[], verdicts: ('pass' | 'fail')[]): StoredReading[] =>
  values.map((value, i) => ({ partId, position: `${i + 1}`, value, verdict: verdicts[i]! }));

// Verdicts as the station stored them under the current rule (judged by hand against 4.0295–4.0305).
const READINGS: StoredReading[] = [
  ...bores('A', [4.03, 4.0302, 4.0301, 4.0299], ['pass', 'pass', 'pass', 'pass']),
  // 4.03045 rounds half-to-even to 4.0304 (ASTM E29), inside the tighter limit; 4.0305 is not
  ...bores('B', [4.0304, 4.03045, 4.0305, 4.03], ['pass', 'pass', 'pass', 'pass']),
  ...bores('C', [4.0306, 4.03, 4.0298, 4.0301], ['fail', 'pass', 'pass', 'pass']),
  { partId: 'C', position: 'note', value: null, verdict: 'pass' },
];

/** The same readings a part at a time, side by side, as the database keeps them. */
const columns = (readings: readonly StoredReading[]): PartColumns[] => {
  const byPart = new Map<
    string,
    { partId: string; positions: string[]; values: (number | null)[]; verdicts: ('pass' | 'fail')[] }
  >();
  for (const r of readings) {
    const p = byPart.get(r.partId) ?? { partId: r.partId, positions: [], values: [], verdicts: [] };
    p.positions.push(r.position);
    p.values.push(r.value);
    p.verdicts.push(r.verdict);
    byPart.set(r.partId, p);
  }
  return [...byPart.values()];
};

describe('rehearsing a rule change on stored readings', () => {
  it('when the readings come a part at a time side by side, then the rehearsal is the same as from one reading at a time', () => {
    for (const rule of [tighter, looser]) {
      expect(rehearseParts({ parts: columns(READINGS), rule, current })).toEqual(
        rehearseRule({ readings: READINGS, rule, current }),
      );
    }
    // a part's readings need not be together in the one-at-a-time form: the parts are still the same
    const interleaved = [...READINGS].sort((a, b) => a.position.localeCompare(b.position));
    expect(rehearseRule({ readings: interleaved, rule: tighter, current }).parts).toEqual(
      rehearseParts({ parts: columns(READINGS), rule: tighter, current }).parts,
    );
  });

  it('when the limit is tightened to ± 0.0004, then only 4.0305 flips pass → fail, and part B with it', () => {
    const r = rehearseRule({ readings: READINGS, rule: tighter, current });
    expect(r.readings).toEqual([
      {
        partId: 'B',
        position: '3',
        value: 4.0305,
        rounded: 4.0305,
        was: 'pass',
        now: 'fail',
        flip: 'pass-to-fail',
        reason: '4.0305 in is above the upper limit 4.0304 in',
      },
    ]);
    expect(r.parts).toEqual([{ partId: 'B', was: 'pass', now: 'fail', flip: 'pass-to-fail', failingPositions: ['3'] }]);
    expect(r.counts).toMatchObject({
      readings: 13,
      skipped: 1,
      readingsPassToFail: 1,
      readingsFailToPass: 0,
      parts: 3,
      partsPassToFail: 1,
      partsFailToPass: 0,
      partsFailingBefore: 1,
      partsFailingAfter: 2,
    });
  });

  it('when the limit is widened to ± 0.0006, then 4.0306 flips fail → pass and part C passes', () => {
    const r = rehearseRule({ readings: READINGS, rule: looser, current });
    expect(r.readings.map((f) => [f.partId, f.position, f.flip])).toEqual([['C', '1', 'fail-to-pass']]);
    expect(r.parts).toEqual([{ partId: 'C', was: 'fail', now: 'pass', flip: 'fail-to-pass', failingPositions: [] }]);
    expect(r.counts.partsFailingAfter).toBe(0);
  });

  it('when the draft sets no resolution, then the characteristic’s is used, as on the station form', () => {
    const noResolution = { ...tighter, resolution: null };
    // at 0.001 in, 4.0305 rounds half-to-even to 4.030 and passes; 4.0306 rounds to 4.031 and fails
    const r = rehearseRule({ readings: READINGS, rule: noResolution, resolution: 0.001 });
    expect(r.readings).toEqual([]);
    expect(rehearseRule({ readings: READINGS, rule: noResolution }).readings.map((f) => f.value)).toEqual([
      4.03045, 4.0305,
    ]);
  });

  it('when a within σ is given, then the new Cpk is min(USL − μ, μ − LSL)/3σ against the draft limits (μ from jstat)', () => {
    const r = rehearseRule({ readings: READINGS, rule: tighter, current, sigmaWithin: 0.0002 });
    const mu = jStat.mean(READINGS.flatMap((x) => (x.value === null ? [] : [x.value])));
    expect(r.capability.after!.within!.index).toBeCloseTo(Math.min(4.0304 - mu, mu - 4.0296) / 0.0006, 9);
    expect(r.capability.before!.within!.index).toBeCloseTo(Math.min(4.0305 - mu, mu - 4.0295) / 0.0006, 9);
    expect(r.capability.after!.within!.index).toBeLessThan(r.capability.before!.within!.index);
  });

  it('when no σ is given and every part has four readings, then σ comes from the part-means chart of the same readings', () => {
    const r = rehearseRule({ readings: READINGS, rule: tighter });
    const parts = ['A', 'B', 'C'].map((key) => ({
      key,
      values: READINGS.filter((x) => x.partId === key && x.value !== null).map((x) => x.value!),
    }));
    expect(r.capability.sigmaWithin).toBeCloseTo(partMeansChart(parts).sigmaWithin, 12);
    expect(r.capability.before).toBeNull(); // no rule in force was given
  });

  it('when an attribute rule is rehearsed on measured readings, then it is refused by the judge itself', () => {
    expect(() => rehearseRule({ readings: READINGS, rule: { limitType: 'attribute' } })).toThrow(/attribute rule/);
  });
});
