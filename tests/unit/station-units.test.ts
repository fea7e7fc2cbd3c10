import { describe, expect, it } from 'vitest';
import type { FormCharacteristic } from '../../src/api/station/types';
import { entryUnitOf, judge, readTyped, slotsOf } from '../../src/routes/station/readings';
import { planFill } from '../../src/routes/station/run-test-fill';
import { readingsOf } from '../../src/routes/station/submit';

// The station form's side of typing a reading in another unit: it converts as the server does
// (NIST SP 811 factors, kept to 6 decimals), judges in the rule's unit, and sends what was typed.

const bore: FormCharacteristic = {
  code: 'bore',
  name: 'Cylinder bore diameter',
  kind: 'variable',
  unit: 'in',
  resolution: 0.0001,
  critical: true,
  positions: [{ code: 'c1', label: 'Cylinder 1' } as FormCharacteristic['positions'][number]],
  derivation: null,
  physicalMin: 2,
  physicalMax: 6,
  rule: {
    id: 1,
    version: 1,
    limitType: 'nominal',
    nominal: 4.03,
    minusTol: 0.0005,
    plusTol: 0.0005,
    lowerLimit: null,
    upperLimit: null,
    unit: 'in',
    resolution: 0.0001,
  } as FormCharacteristic['rule'],
};

describe('typing a reading in another unit at the station', () => {
  it('when 102.36708 mm is typed for an inch bore, then it reads 4.0302 in and passes', () => {
    // NIST SP 811: 1 in = 25.4 mm exactly, so 102.36708 mm = 4.0302 in
    expect(readTyped(bore, '102,36708', 'mm')).toEqual({
      state: 'number',
      value: 4.0302,
      entered: { value: 102.36708, unit: 'mm' },
    });
    const slots = slotsOf([bore]);
    const judged = judge([bore], slots, [{ text: '102.36708', choice: '', where: '' }], { bore: 'mm' });
    expect(judged.readings.get('bore@c1')).toMatchObject({ verdict: 'pass', rounded: 4.0302 });
    // sent as typed, with its unit: the server converts it the same way
    expect(readingsOf(slots, judged, [{ text: '102.36708', choice: '', where: '' }])).toEqual([
      { characteristic: 'bore', position: 'c1', value: 102.36708, unit: 'mm' },
    ]);
  });

  it('when the same figure is typed in the rule’s own unit, then nothing is converted', () => {
    expect(readTyped(bore, '4.0302', 'in')).toEqual({ state: 'number', value: 4.0302 });
    expect(readTyped(bore, '4.0302')).toEqual({ state: 'number', value: 4.0302 });
  });

  it('when 4.03 is typed in mm by a slip, then it is not a possible bore (0.158661 in)', () => {
    expect(readTyped(bore, '4.03', 'mm')).toMatchObject({ state: 'impossible', value: 0.158661 }); // 4.03 ÷ 25.4
  });

  it('when the person prefers mm for inch characteristics, then the form opens in mm unless changed here', () => {
    expect(entryUnitOf(bore, {}, { in: 'mm' })).toBe('mm');
    expect(entryUnitOf(bore, { bore: 'µm' }, { in: 'mm' })).toBe('µm');
    expect(entryUnitOf(bore, {}, { in: 'psi' })).toBe('in'); // a stale preference of another quantity is ignored
    expect(entryUnitOf(bore, {}, {})).toBe('in');
  });

  it('when a test stand sends kPa for a box typed in psi, then the fill is converted, and a unit of another quantity is left out', () => {
    const oil = { ...bore, code: 'oil', name: 'Oil pressure', unit: 'psi', physicalMin: 0, physicalMax: 150 };
    const slots = slotsOf([oil]);
    const plan = planFill(
      slots,
      [
        { characteristic: 'oil', position: 'c1', value: 345, unit: 'kPa' },
        { characteristic: 'oil', position: 'c1', value: 2, unit: 'in' },
      ] as Parameters<typeof planFill>[1],
      { oil: 'psi' },
    );
    // 345 kPa ÷ 6.894 757 293 kPa/psi = 50.038 019 5 (NIST SP 811 factor, recomputed), shown to 6 decimals
    expect(plan.fills.map((f) => f.text)).toEqual(['50.03802']);
    expect(plan.unused.map((u) => u.why)).toEqual(['in in, but this form records psi']);
  });
});
