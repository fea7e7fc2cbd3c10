import { checkCharacter, MOD_37_2 } from './check-character.js';
import type { PartKind } from '../schemas/reference.js';

/**
 * Coretrail serials: a kind prefix, seven body characters and one ISO/IEC 7064 MOD 37-2 check
 * character, printed as `BK-7KX4-P2MK` (the last character is the check).
 *
 * People read serials aloud and type them with gloves on, so no serial ever contains 0, 1, I or
 * O. The body uses the 32 characters below; a serial whose check character would be one of the
 * confusable five (0, 1, I, O, *) is never issued — the generator draws another body.
 */
export const SERIAL_ALPHABET = '23456789ABCDEFGHJKLMNPQRSTUVWXYZ';
const CONFUSABLE = new Set(['0', '1', 'I', 'O', '*']);

export const SERIAL_PREFIX: Record<PartKind, string> = {
  core: 'CR',
  block: 'BK',
  crankshaft: 'CK',
  cylinder_head: 'HD',
  camshaft: 'CM',
  rod_set: 'RS',
  long_block: 'LB',
};
const KIND_BY_PREFIX = new Map(Object.entries(SERIAL_PREFIX).map(([k, p]) => [p, k as PartKind]));

const BODY_LENGTH = 7;
const COMPACT = new RegExp(`^([A-Z]{2})([${SERIAL_ALPHABET}]{${BODY_LENGTH}})([${SERIAL_ALPHABET}])$`);

/** `BK7KX4P2MK` → `BK-7KX4-P2MK`. */
export function formatSerial(compact: string): string {
  return `${compact.slice(0, 2)}-${compact.slice(2, 6)}-${compact.slice(6)}`;
}

/** A new serial for a kind; `random` returns integers in [0, n) (crypto on the server). */
export function makeSerial(kind: PartKind, random: (n: number) => number): string {
  const prefix = SERIAL_PREFIX[kind];
  for (;;) {
    let body = '';
    for (let i = 0; i < BODY_LENGTH; i++) body += SERIAL_ALPHABET[random(SERIAL_ALPHABET.length)];
    const check = checkCharacter(prefix + body, MOD_37_2);
    if (!CONFUSABLE.has(check)) return formatSerial(prefix + body + check);
  }
}

export type SerialCheck = { ok: true; serial: string; kind: PartKind } | { ok: false; reason: string };

/**
 * Reads what someone typed or scanned: case, spaces and dashes do not matter. Says plainly what is
 * wrong, so a mistyped serial is caught before any request is sent.
 */
export function parseSerial(input: string): SerialCheck {
  const compact = input.toUpperCase().replace(/[\s\-–—_.]/g, '');
  if (!compact) return { ok: false, reason: 'Enter or scan a serial.' };
  if (/[01IO]/.test(compact)) {
    return { ok: false, reason: 'Serials never contain 0, 1, I or O. Check the label again.' };
  }
  const m = COMPACT.exec(compact);
  if (!m) {
    return { ok: false, reason: 'A serial is 2 letters, then 8 letters or digits, like BK-7KX4-P2MK.' };
  }
  const kind = KIND_BY_PREFIX.get(m[1]!);
  if (!kind) return { ok: false, reason: `"${m[1]}" is not the start of any Coretrail serial.` };
  if (checkCharacter(m[1]! + m[2]!, MOD_37_2) !== m[3]) {
    return { ok: false, reason: 'One character is wrong or two are swapped: the check character does not match.' };
  }
  return { ok: true, serial: formatSerial(compact), kind };
}
