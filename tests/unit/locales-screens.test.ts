import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

// the words a screen brings with its own chunk, and those fetched with Spanish (src/locales/<part>/)
const root = path.resolve('src/locales');
const parts = fs.readdirSync(root, { withFileTypes: true }).filter((d) => d.isDirectory());
const read = (part: string, lang: string) =>
  JSON.parse(fs.readFileSync(path.join(root, part, `${lang}.json`), 'utf8')) as Record<string, string>;
const placeholders = (s: string) => [...s.matchAll(/\{\{(\w+)\}\}/g)].map((m) => m[1]).sort();

describe('the screens’ own message files', () => {
  it.each(parts.map((d) => d.name))(
    'when %s has a message in English, then Spanish has it too, with the same {{placeholders}}, and no other',
    (part) => {
      const english = read(part, 'en');
      const spanish = read(part, 'es');
      expect(Object.keys(english).filter((k) => !(k in spanish))).toEqual([]);
      expect(Object.keys(spanish).filter((k) => !(k in english))).toEqual([]);
      expect(
        Object.keys(english).filter((k) => placeholders(english[k]!).join() !== placeholders(spanish[k]!).join()),
      ).toEqual([]);
      expect(Object.values(spanish).filter((v) => !v.trim())).toEqual([]);
    },
  );

  it('when a screen registers its words, then their keys are not also in the first load (en.json), so they are not sent twice', () => {
    const first = JSON.parse(fs.readFileSync(path.join(root, 'en.json'), 'utf8')) as Record<string, string>;
    for (const d of parts) expect(Object.keys(read(d.name, 'en')).filter((k) => k in first)).toEqual([]);
  });
});
