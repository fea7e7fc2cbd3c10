import { describe, expect, it } from 'vitest';
import { parseRunCsv, type RunCsvChar } from '../../shared/domain/run-csv.js';

// a run test a plant defined for itself (invented for this test): codes of its own, no stand aliases
const cyl = (n: number) => Array.from({ length: n }, (_, i) => ({ code: `c${i + 1}`, cylinder: i + 1 }));
const CHARS: RunCsvChar[] = [
  { code: 'coolant-out', name: 'Coolant outlet temperature', kind: 'variable', unit: '°C', positions: [{ code: '' }] },
  { code: 'cyl-leakdown', name: 'Cylinder leak-down', kind: 'variable', unit: '%', positions: cyl(4) },
  { code: 'seep-free', name: 'No seepage', kind: 'attribute', unit: null, positions: [{ code: '' }] },
  { code: 'leak-spread', name: 'Leak-down spread', kind: 'derived', unit: '%', positions: [{ code: '' }] },
];
const HEAD = 'channel,cylinder,value,unit';
const read = (...rows: string[]) => parseRunCsv([HEAD, ...rows].join('\n'), CHARS, 4);

describe("a test stand's CSV read into a plant's own run test", () => {
  it('when channels name the stage’s characteristics by code, then each row lands on its position', () => {
    expect(read('COOLANT-OUT,,88,°C', 'cyl-leakdown,3,6.5,%', 'seep-free,,PASS,')).toEqual({
      ok: true,
      readings: [
        { characteristic: 'coolant-out', position: '', value: 88, unit: '°C' },
        { characteristic: 'cyl-leakdown', position: 'c3', value: 6.5, unit: '%' },
        { characteristic: 'seep-free', position: '', passed: true },
      ],
    });
  });

  it('when a value comes in another unit of its quantity, then it is kept as sent for the station to convert; an empty unit is the characteristic’s own', () => {
    expect(read('coolant-out,,190,°F', 'cyl-leakdown,1,5,')).toMatchObject({
      ok: true,
      readings: [
        { characteristic: 'coolant-out', value: 190, unit: '°F' },
        { characteristic: 'cyl-leakdown', value: 5, unit: '%' },
      ],
    });
  });

  it('when a row cannot be placed, then the file is refused at that line and column with the reason', () => {
    expect(read('oil-temp,,90,°C')).toMatchObject({
      ok: false,
      line: 2,
      column: 1,
      message:
        'Line 2, column 1: unknown channel “oil-temp” (this run test reads: coolant-out, cyl-leakdown, seep-free).',
    });
    expect(read('coolant-out,,88,psi')).toMatchObject({ ok: false, line: 2, column: 4 });
    expect(read('coolant-out,2,88,°C')).toMatchObject({ ok: false, column: 2 });
    expect(read('cyl-leakdown,5,6,%')).toMatchObject({
      ok: false,
      message: 'Line 2, column 2: cylinder “5” is not 1–4.',
    });
    expect(read('leak-spread,,2,%')).toMatchObject({ ok: false, column: 1 });
    expect(read('seep-free,,MAYBE,')).toMatchObject({ ok: false, column: 3 });
    expect(read('cyl-leakdown,1,5,%', 'CYL-LEAKDOWN,1,5,%')).toMatchObject({ ok: false, line: 3 });
  });
});
