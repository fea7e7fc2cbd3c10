import { useSyncExternalStore } from 'react';
import rosetta from 'rosetta';
import en from '../locales/en.json';
import { formatGrouped, formatWhen } from './format';

/**
 * The floor screens' words, in JSON files a translator edits (src/locales/<lang>.json). English is
 * part of the first load; Spanish is fetched only when someone needs it, so the station's first
 * screen carries one language. A key missing from Spanish falls back to the English words.
 * `{{name}}` in a message is replaced by that parameter; a message with a count has `_one` and
 * `_other` forms, chosen by the language's plural rules (Intl.PluralRules).
 */
export type Language = 'en' | 'es';
type Messages = Record<string, string>;

const i18n = rosetta<Messages>({ en });
i18n.locale('en');
let current: Language = 'en';
const listeners = new Set<() => void>();
// bumped whenever words change (a language switched, a screen's Spanish arrived): what re-renders useT's callers
let version = 0;
const notify = () => {
  version += 1;
  listeners.forEach((l) => l());
};
const KEY = 'coretrail.language';

// Spanish as written in Spain and most of Latin America: a decimal comma (12,34), as the plant asked
const locales: Record<Language, string> = { en: 'en-US', es: 'es-ES' };

type Spanish = () => Promise<{ default: Messages }>;

/**
 * Spanish words kept apart from es.json, fetched with it: the refusals' sentences by code and the
 * labels shared code writes in English (their English is the code's own, so English loads neither),
 * then each screen's own words as its chunk registers them (addWords).
 */
const spanishParts: { load: Spanish; done: Promise<void> | null }[] = [
  { load: () => import('../locales/server/es.json'), done: null },
  { load: () => import('../locales/labels/es.json'), done: null },
];

const loadPart = (part: (typeof spanishParts)[number]) =>
  (part.done ??= part.load().then((m) => i18n.set('es', m.default)));

async function load(lang: Language) {
  if (lang !== 'es') return;
  if (!i18n.table('es')) i18n.set('es', (await import('../locales/es.json')).default);
  await Promise.all(spanishParts.map(loadPart));
}

/**
 * A screen's own words (src/locales/<screen>/), registered by the screen's chunk so neither its
 * English nor its Spanish rides in the first load: English at once, Spanish when the screen is
 * shown in Spanish. Returns what the screen's loader awaits, so its first render has its words.
 */
export function addWords(english: Messages, spanish: Spanish): () => Promise<void> {
  i18n.set('en', english);
  const part = { load: spanish, done: null };
  spanishParts.push(part);
  return async () => {
    if (current !== 'es') return;
    const first = !part.done;
    await loadPart(part);
    if (first) notify();
  };
}

/** Switches every screen to `lang` once its words are here; remembered for the sign-in page. */
export async function setLanguage(lang: Language): Promise<void> {
  await load(lang);
  if (lang === current) return;
  current = lang;
  i18n.locale(lang);
  document.documentElement.lang = lang;
  try {
    window.localStorage.setItem(KEY, lang);
  } catch {
    // storage switched off: the sign-in page speaks English, the person's own setting the rest
  }
  notify();
}

/** The language of the last person who signed in on this device, for the screens before sign-in. */
export function rememberedLanguage(): Language {
  try {
    return window.localStorage.getItem(KEY) === 'es' ? 'es' : 'en';
  } catch {
    return 'en';
  }
}

type Params = Record<string, string | number>;

/** `fallback`: the words when neither language has the key (a label made elsewhere, such as a role's). */
export function t(key: string, params?: Params, fallback?: string): string {
  const count = params?.count;
  const full =
    typeof count === 'number'
      ? `${key}_${new Intl.PluralRules(locales[current]).select(count) === 'one' ? 'one' : 'other'}`
      : key;
  const shown = typeof count === 'number' ? { ...params, count: formatNumber(count) } : params;
  // as a one-item path: rosetta would read the dots in a key as nesting
  return i18n.t([full], shown) || i18n.t([full], shown, 'en') || fallback || key;
}

/** The words for `key`, or null when neither language has it (where a caller has words of its own to fall back on). */
export function known(key: string, params?: Params): string | null {
  const NONE = '\u0000';
  const s = t(key, params, NONE);
  return s === NONE ? null : s;
}

export const language = () => current;

/** Every English message loaded so far (the first load's and the screens' registered since). */
export const englishWords = (): Messages => i18n.table('en') ?? {};

/** Numbers as the language writes them: 12.34 in English, 12,34 in Spanish (readings take either sign as typed). */
export const formatNumber = (n: number, options?: Intl.NumberFormatOptions) =>
  new Intl.NumberFormat(locales[current], options).format(n);

/**
 * A moment, day and time, as the language writes it: English keeps the product's own 2026-12-04 17:55
 * (lib/format.ts), Spanish writes 4 dic 2026, 17:55.
 */
export const formatMoment = (iso: string) =>
  current === 'en'
    ? formatWhen(iso)
    : new Intl.DateTimeFormat(locales[current], { dateStyle: 'medium', timeStyle: 'short' }).format(new Date(iso));

/** A count in running text: English keeps the product's thin-space groups (lib/format.ts), Spanish its own. */
export const formatCount = (n: number) => (current === 'en' ? formatGrouped(n) : formatNumber(n));

/** A calendar day (2026-12-01) as the language writes it; English keeps the ISO day. */
export const formatDay = (isoDay: string) => {
  if (current === 'en' || !/^\d{4}-\d{2}-\d{2}$/.test(isoDay)) return isoDay;
  const [y, m, d] = isoDay.split('-').map(Number) as [number, number, number];
  return new Intl.DateTimeFormat(locales[current], { dateStyle: 'medium' }).format(new Date(y, m - 1, d));
};

const subscribe = (onChange: () => void) => {
  listeners.add(onChange);
  return () => listeners.delete(onChange);
};

/** Re-renders the component when the language changes; returns the translator. */
export function useT(): typeof t {
  useSyncExternalStore(subscribe, () => version);
  return t;
}
