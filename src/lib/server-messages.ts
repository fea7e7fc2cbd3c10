import { englishWords, known, language, t } from './i18n';

/**
 * The server answers in English with a stable `code` (and for a 409 often a `reason`). On a Spanish
 * floor screen its words are chosen here, in one place, from the locale files:
 *
 * - `server.<code>.<reason>` or `server.<code>`: one plain sentence for the refusal, by its code. The
 *   server's own English sentence may name a serial or a stage; the field notes (below) carry the
 *   detail where the screen shows them beside the field.
 * - `schema.*`: the shared schemas' and the server's per-field notes, whose English entry is the
 *   exact wording (with `{{placeholders}}` where the wording holds a number or a name). They have no
 *   code of their own, so they are found by their English words; each screen brings its own with
 *   its words (src/locales/<screen>/), the general ones are in en.json.
 *
 * A message with neither stays in the server's English, so a new refusal is never hidden.
 */

type Template = { key: string; pattern: RegExp; names: string[] };

const escape = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

function compile(key: string, english: string): Template {
  const names: string[] = [];
  const source = english
    .split(/(\{\{\w+\}\})/)
    .map((part) => {
      const name = /^\{\{(\w+)\}\}$/.exec(part)?.[1];
      if (!name) return escape(part);
      names.push(name);
      return '([\\s\\S]+?)';
    })
    .join('');
  return { key, names, pattern: new RegExp(`^${source}$`) };
}

// made again when a screen registers more words (lib/i18n.ts addWords)
let templates: { from: number; list: Template[] } = { from: -1, list: [] };
function all(): Template[] {
  const english = englishWords();
  const keys = Object.keys(english);
  if (templates.from !== keys.length) {
    const list = keys.filter((k) => k.startsWith('schema.')).map((k) => compile(k, english[k]!));
    templates = { from: keys.length, list };
  }
  return templates.list;
}

/** Spanish words for the labels the shared code writes in English (part kinds, statuses…), by their English. */
export const label = (englishLabel: string) => t(`label.${englishLabel}`, undefined, englishLabel);

/** A part's name with its side where it has one ("Cylinder head (left)"), in the screen's language. */
export function partLabel(englishName: string): string {
  const side = /^(.*) \((left|right)\)$/.exec(englishName);
  return side ? `${label(side[1]!)} (${label(side[2]!)})` : label(englishName);
}

/** A word the server put inside its sentence ("a crankshaft", "B-1042 (block)", "cracked and broken"), in the language where it is a known label. */
function param(value: string): string {
  const one = (word: string) => {
    const found = known(`label.${word.charAt(0).toUpperCase()}${word.slice(1)}`);
    if (!found) return word;
    return word.charAt(0) === word.charAt(0).toLowerCase() ? found.toLowerCase() : found;
  };
  const named = /^(\S+) \(([^()]+)\)$/.exec(value);
  if (named) return `${named[1]} (${one(named[2]!)})`;
  if (/, | and /.test(value)) {
    const parts = value.split(/, | and /).map(one);
    return parts.length > 1 ? `${parts.slice(0, -1).join(', ')} ${t('common.and')} ${parts.at(-1)}` : parts[0]!;
  }
  return one(value);
}

/** A stage's safety caution: the demo plant's own wordings have their Spanish (hazard.*); any other shows as written. */
export function localizeHazard(text: string): string {
  if (language() === 'en') return text;
  const english = englishWords();
  const key = Object.keys(english).find((k) => k.startsWith('hazard.') && english[k] === text);
  return (key && known(key)) || text;
}

/** A field's note (a shared schema's or the server's), in the screen's language when its wording is known. */
export function localizeText(text: string): string {
  if (language() === 'en' || !text) return text;
  for (const tpl of all()) {
    const m = tpl.pattern.exec(text);
    if (!m) continue;
    const spanish = known(tpl.key, Object.fromEntries(tpl.names.map((n, i) => [n, param(m[i + 1]!)])));
    if (spanish) return spanish;
  }
  return text;
}

/** The refusal's sentence in the screen's language, chosen by code (and reason); the server's English otherwise. */
export function serverMessage(code: string, message: string, reason?: unknown): string {
  if (language() === 'en') return message;
  const byReason = typeof reason === 'string' ? known(`server.${code}.${reason}`) : null;
  if (byReason) return byReason;
  const note = localizeText(message);
  if (note !== message) return note;
  const general = known(`server.${/^http_\d+$/.test(code) ? 'http' : code}`);
  return general ?? message;
}

/** The per-field notes of a refusal, each in the screen's language when known. */
export function serverFields(fields: Record<string, string>): Record<string, string> {
  if (language() === 'en') return fields;
  return Object.fromEntries(Object.entries(fields).map(([k, v]) => [k, localizeText(v)]));
}
