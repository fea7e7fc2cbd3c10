import { describe, expect, it } from 'vitest';
import en from '../../src/locales/en.json';
import es from '../../src/locales/es.json';
import { ROLES } from '../../shared/roles.js';
import { AREAS } from '../../src/routes/app/areas.js';

const placeholders = (s: string) => [...s.matchAll(/\{\{(\w+)\}\}/g)].map((m) => m[1]).sort();
// keys only Spanish needs: English shows the label the code already has (areas.ts, shared/roles.ts)
const spanishOnly = (k: string) => k.startsWith('nav.area.') || k.startsWith('role.');

describe('the floor screens’ message files', () => {
  it('when a message is in English, then Spanish has it too, with the same {{placeholders}}', () => {
    const english = en as Record<string, string>;
    const spanish = es as Record<string, string>;
    expect(Object.keys(english).filter((k) => !(k in spanish))).toEqual([]);
    expect(Object.keys(spanish).filter((k) => !(k in english) && !spanishOnly(k))).toEqual([]);
    const differ = Object.keys(english).filter(
      (k) => k in spanish && placeholders(english[k]!).join() !== placeholders(spanish[k]!).join(),
    );
    expect(differ).toEqual([]);
  });

  it('when Spanish is spoken, then every area of the navigation and every role has its Spanish name', () => {
    const spanish = es as Record<string, string>;
    expect(AREAS.map((a) => `nav.area.${a.label}`).filter((k) => !spanish[k])).toEqual([]);
    expect(ROLES.map((r) => `role.${r}`).filter((k) => !spanish[k])).toEqual([]);
  });
});
