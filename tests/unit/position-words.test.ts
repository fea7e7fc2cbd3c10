import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { expandPositions } from '../../shared/domain/positions.js';
import { setLanguage } from '../../src/lib/i18n.js';
import { groupLabel, localizeForm, positionLabel, positionWord } from '../../src/lib/position-words.js';
import type { StationFormJson } from '../../shared/schemas/results.js';

// an invented V8 and inline six, as the demo plant's families are shaped
const V8 = { layout: 'v' as const, cylinders: 8, headsPerEngine: 2 };
const I6 = { layout: 'inline' as const, cylinders: 6, headsPerEngine: 1 };
const block = { kind: 'block', positionLabel: null };

describe('positions in the screen’s language', () => {
  beforeAll(async () => {
    vi.stubGlobal('document', { documentElement: { lang: 'en' } });
    vi.stubGlobal('window', { localStorage: { setItem: () => undefined, getItem: () => null } });
  });
  afterAll(async () => {
    await setLanguage('en');
    vi.unstubAllGlobals();
  });

  it('when the screen is in English, then every label is the server’s own, unchanged', () => {
    const all = [
      ...expandPositions(
        { per: 'cylinder', depths: ['top', 'middle', 'bottom'], axes: ['thrust', 'axial'] },
        V8,
        block,
      ),
      ...expandPositions({ per: 'main', axes: ['vertical', 'horizontal'] }, I6, block),
      ...expandPositions({ per: 'deck', points: 3 }, V8, block),
      ...expandPositions({ per: 'part' }, I6, block),
    ];
    expect(all.map((p) => positionLabel(p.code, p.label))).toEqual(all.map((p) => p.label));
    expect(groupLabel('Left bank')).toBe('Left bank');
  });

  it('when it is in Spanish, then each position is named from its code, and one it cannot read keeps its English', async () => {
    await setLanguage('es');
    const bores = expandPositions({ per: 'cylinder', depths: ['top'], axes: ['thrust'] }, V8, block);
    expect(positionLabel(bores[0]!.code, bores[0]!.label)).toBe('Cilindro 1, superior, empuje');
    expect(groupLabel(bores[0]!.group)).toBe('Lado izquierdo');
    expect(groupLabel(bores[7]!.group)).toBe('Lado derecho');
    const valves = expandPositions({ per: 'valve' }, I6, { kind: 'cylinder_head', positionLabel: null });
    expect(positionLabel(valves[1]!.code, valves[1]!.label)).toBe('Cilindro 1 escape');
    const mains = expandPositions({ per: 'main', axes: ['vertical'] }, I6, block);
    expect(positionLabel(mains[6]!.code, mains[6]!.label)).toBe('Bancada 7, vertical');
    const deck = expandPositions({ per: 'deck', points: 2 }, V8, block);
    expect(positionLabel(deck[1]!.code, deck[1]!.label)).toBe('Plano izquierdo, punto 2');
    expect(positionLabel('', 'Whole part')).toBe('Pieza completa');
    expect(positionLabel('c1/weird', 'Cylinder 1, weird')).toBe('Cylinder 1, weird');
    expect(positionWord('middle')).toBe('Medio');
    const form = { characteristics: [{ code: 'bore', positions: bores.slice(0, 1) }] } as unknown as StationFormJson;
    expect(localizeForm(form).characteristics[0]!.positions[0]).toMatchObject({
      code: 'c1/top/thrust',
      label: 'Cilindro 1, superior, empuje',
      group: 'Lado izquierdo',
    });
  });
});
