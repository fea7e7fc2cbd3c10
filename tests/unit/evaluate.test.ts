import { describe, expect, it } from 'vitest';
import { deriveValue, evaluateForm, type FormCharacteristic } from '../../shared/domain/evaluate.js';
import {
  crankpinsOf,
  describePosition,
  expandPositions,
  mainBearingsOf,
  type FamilyShape,
} from '../../shared/domain/positions.js';

const v8: FamilyShape = { layout: 'v', cylinders: 8, headsPerEngine: 2 };
const six: FamilyShape = { layout: 'inline', cylinders: 6, headsPerEngine: 1 };
const block = { kind: 'block', positionLabel: null };

describe('positions of a part', () => {
  it('a V8 block at bore and hone: 8 cylinders × 3 depths × 2 axes, split into two banks', () => {
    const ps = expandPositions(
      { per: 'cylinder', depths: ['top', 'middle', 'bottom'], axes: ['thrust', 'axial'] },
      v8,
      block,
    );
    expect(ps).toHaveLength(48);
    expect(ps[0]).toEqual({
      code: 'c1/top/thrust',
      label: 'Cylinder 1, top, thrust',
      group: 'Left bank',
      cylinder: 1,
      depth: 'top',
      axis: 'thrust',
    });
    expect(new Set(ps.filter((p) => p.group === 'Right bank').map((p) => p.cylinder))).toEqual(new Set([5, 6, 7, 8]));
  });
  it('a V head covers its own bank; an inline head every cylinder', () => {
    const right = expandPositions({ per: 'valve' }, v8, { kind: 'cylinder_head', positionLabel: 'right' });
    expect(right.map((p) => p.code)).toEqual(['c5/in', 'c5/ex', 'c6/in', 'c6/ex', 'c7/in', 'c7/ex', 'c8/in', 'c8/ex']);
    expect(
      expandPositions({ per: 'valve', valves: ['ex'] }, six, { kind: 'cylinder_head', positionLabel: null }),
    ).toHaveLength(6);
  });
  it('main bearings and crankpins (common practice): inline six 7 mains 6 pins, V8 5 mains 4 pins', () => {
    expect([mainBearingsOf(six), crankpinsOf(six)]).toEqual([7, 6]);
    expect([mainBearingsOf(v8), crankpinsOf(v8)]).toEqual([5, 4]);
    expect(expandPositions({ per: 'main', axes: ['vertical', 'horizontal'] }, v8, block)).toHaveLength(10);
  });
  it('decks: two on a V block, one on an inline block or a head', () => {
    expect(expandPositions({ per: 'deck', points: 6 }, v8, block)).toHaveLength(12);
    expect(expandPositions({ per: 'deck' }, six, block).map((p) => p.code)).toEqual(['deck']);
  });
  it('reads a position code back in words', () => {
    expect(describePosition('c3/top/thrust')).toBe('Cylinder 3, top, thrust');
    expect(describePosition('deck-l/p4')).toBe('Left deck, point 4');
    expect(describePosition('')).toBe('whole part');
  });
});

describe('derived characteristics (formulas: common shop practice)', () => {
  const bore = new Map([
    ['c1/top/thrust', 4.0304],
    ['c1/top/axial', 4.0301],
    ['c1/bottom/thrust', 4.0298],
    ['c1/bottom/axial', 4.0299],
  ]);
  const expected = () => [...bore.keys()];
  const typed = () => bore;
  it('out-of-round at one depth is the largest minus the smallest diameter there, in decimal', () => {
    expect(deriveValue({ fn: 'out_of_round', of: 'bore' }, 'c1/top', expected, typed)).toBe(0.0003);
  });
  it('taper is the largest top-to-bottom difference over the axes measured', () => {
    expect(deriveValue({ fn: 'taper', of: 'bore', top: 'top', bottom: 'bottom' }, 'c1', expected, typed)).toBe(0.0006);
  });
  it('is not computed until every reading it needs is there', () => {
    const partial = new Map([...bore].slice(0, 3));
    expect(deriveValue({ fn: 'out_of_round', of: 'bore' }, 'c1/bottom', expected, () => partial)).toBeNull();
  });
  it('compression spread is (highest − lowest) / highest, as a percentage: 150 and 135 psi → 10 %', () => {
    const comp = new Map([
      ['c1', 150],
      ['c2', 135],
      ['c3', 148],
    ]);
    expect(
      deriveValue(
        { fn: 'spread_pct', of: 'comp' },
        '',
        () => [...comp.keys()],
        () => comp,
      ),
    ).toBe(10);
  });
  it('piston-to-wall and oil clearance are outer minus inner diameter', () => {
    const values: Record<string, Map<string, number>> = {
      bore: new Map([['c1/middle/thrust', 4.0305]]),
      skirt: new Map([['c1', 4.0285]]),
    };
    const d = { fn: 'clearance' as const, outer: 'bore', inner: 'skirt', outerAt: 'middle/thrust' };
    expect(
      deriveValue(
        d,
        'c1',
        () => [],
        (c) => values[c]!,
      ),
    ).toBe(0.002);
  });
});

describe('a whole form', () => {
  const chars: FormCharacteristic[] = [
    {
      code: 'pts',
      name: 'Deck point',
      kind: 'variable',
      unit: 'in',
      resolution: 0.0001,
      critical: false,
      positions: expandPositions({ per: 'deck', points: 3 }, six, block),
      derivation: null,
      physicalMin: -0.05,
      physicalMax: 0.05,
      rule: { id: 1, version: 1, limitType: 'range', lowerLimit: -0.01, upperLimit: 0.01, resolution: 0.0001 },
    },
    {
      code: 'flat',
      name: 'Deck flatness',
      kind: 'derived',
      unit: 'in',
      resolution: 0.0001,
      critical: false,
      positions: expandPositions({ per: 'deck' }, six, block),
      derivation: { fn: 'flatness', of: 'pts' },
      physicalMin: null,
      physicalMax: null,
      rule: { id: 2, version: 3, limitType: 'max', upperLimit: 0.004, resolution: 0.0001 },
    },
    {
      code: 'crack',
      name: 'No crack',
      kind: 'attribute',
      unit: null,
      resolution: null,
      critical: true,
      positions: [{ code: '', label: 'Whole part', group: '' }],
      derivation: null,
      physicalMin: null,
      physicalMax: null,
      rule: null,
    },
  ];
  it('is undecided while readings are missing, and fails as soon as one reading fails', () => {
    expect(evaluateForm(chars, {}).verdict).toBeNull();
    expect(evaluateForm(chars, { crack: { '': { passed: false } } }).verdict).toBe('fail');
  });
  it('flatness 0.0040 in is on the 0.004 in limit (reconditioning guide figure) and passes; 0.0041 fails', () => {
    const entries = (p3: number) => ({
      pts: { 'deck/p1': { value: 0 }, 'deck/p2': { value: -0.0015 }, 'deck/p3': { value: p3 } },
      crack: { '': { passed: true } },
    });
    const ok = evaluateForm(chars, entries(0.0025));
    expect(ok.verdict).toBe('pass');
    expect(ok.readings.find((r) => r.characteristic === 'flat')).toMatchObject({
      value: 0.004,
      verdict: 'pass',
      ruleVersion: 3,
    });
    const bad = evaluateForm(chars, entries(0.0026));
    expect(bad.verdict).toBe('fail');
    expect(bad.readings.find((r) => r.characteristic === 'flat')!.reason).toBe(
      '0.0041 in is above the upper limit 0.004 in',
    );
  });
});
