import type { Position } from '../../shared/domain/positions';
import type { StationFormJson } from '../../shared/schemas/results';
import { language, t } from './i18n';

/**
 * Where on a part a reading is taken, in the screen's language. The server names positions in
 * English (`Cylinder 3, top, thrust`); in another language the words are rebuilt from the
 * position's code, segment by segment. A segment this does not know keeps the English label whole.
 */
const SEGMENT: [RegExp, (m: RegExpExecArray) => string][] = [
  [/^c(\d+)$/, (m) => t('pos.cylinder', { n: m[1]! })],
  [/^m(\d+)$/, (m) => t('pos.main', { n: m[1]! })],
  [/^r(\d+)$/, (m) => t('pos.rodJournal', { n: m[1]! })],
  [/^p(\d+)$/, (m) => t('pos.point', { n: m[1]! })],
  [/^(top|middle|bottom|thrust|axial|in|ex|vertical|horizontal)$/, (m) => t(`pos.${m[1]}`)],
  [/^deck(-l|-r)?$/, (m) => t(m[1] === '-l' ? 'pos.deckLeft' : m[1] === '-r' ? 'pos.deckRight' : 'pos.deck')],
];

function segmentWords(seg: string): string | null {
  for (const [re, words] of SEGMENT) {
    const m = re.exec(seg);
    if (m) return words(m);
  }
  return null;
}

/** A position's label in the screen's language (`code` as the server sends it, `label` its English). */
export function positionLabel(code: string, label: string): string {
  if (language() === 'en') return label;
  if (code === '') return t('pos.whole');
  if (label === 'Head face') return t('pos.headFace');
  const words = code.split('/').map(segmentWords);
  if (words.some((w) => w === null)) return label;
  const [first, ...rest] = words as string[];
  // a valve reads "Cylinder 3 intake", the rest "Cylinder 3, top, thrust"
  if (/^c\d+\/(in|ex)$/.test(code)) return `${first} ${rest.join(' ')}`;
  return [first, ...rest].join(', ');
}

/** A layout group's name (a bank, a main, a cylinder, a deck) in the screen's language. */
export function groupLabel(group: string): string {
  if (language() === 'en' || !group) return group;
  const known: Record<string, string> = {
    'Left bank': t('pos.leftBank'),
    'Right bank': t('pos.rightBank'),
    'Left deck': t('pos.deckLeft'),
    'Right deck': t('pos.deckRight'),
    Deck: t('pos.deck'),
    'Head face': t('pos.headFace'),
  };
  if (known[group]) return known[group];
  const m = /^(Main|Cylinder) (\d+)$/.exec(group);
  if (m) return t(m[1] === 'Main' ? 'pos.main' : 'pos.cylinder', { n: m[2]! });
  return group;
}

/** One word of a position (a depth or an axis: `top`, `thrust`), capitalised, in the screen's language. */
export function positionWord(word: string): string {
  const shown = language() === 'en' ? word : (segmentWords(word) ?? word);
  return shown.charAt(0).toUpperCase() + shown.slice(1);
}

/** A station form with its positions named in the screen's language; codes are untouched. */
export function localizeForm(form: StationFormJson): StationFormJson {
  if (language() === 'en') return form;
  const place = (p: Position): Position => ({
    ...p,
    label: positionLabel(p.code, p.label),
    group: groupLabel(p.group),
  });
  return { ...form, characteristics: form.characteristics.map((c) => ({ ...c, positions: c.positions.map(place) })) };
}
