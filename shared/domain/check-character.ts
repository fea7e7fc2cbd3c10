/**
 * ISO/IEC 7064 pure check character systems, computed by the standard's recursive method:
 * for each character, P = ((P + value) × radix) mod M; the check value C makes (P + C) ≡ 1 (mod M).
 */
export type PureSystem = { modulus: number; radix: number; alphabet: string };

export const MOD_11_2: PureSystem = { modulus: 11, radix: 2, alphabet: '0123456789X' };
export const MOD_37_2: PureSystem = { modulus: 37, radix: 2, alphabet: '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZ*' };

/** The check character for `data` (characters must be in the system's alphabet, check symbol excluded). */
export function checkCharacter(data: string, system: PureSystem): string {
  let p = 0;
  for (const ch of data) {
    const v = system.alphabet.indexOf(ch);
    if (v < 0 || v >= system.modulus - 1) throw new RangeError(`"${ch}" is not a data character of this system`);
    p = ((p + v) * system.radix) % system.modulus;
  }
  return system.alphabet[(system.modulus + 1 - p) % system.modulus]!;
}

/** True when the last character of `protectedString` is the right check character for the rest. */
export function hasValidCheck(protectedString: string, system: PureSystem): boolean {
  if (protectedString.length < 2) return false;
  try {
    return checkCharacter(protectedString.slice(0, -1), system) === protectedString.slice(-1);
  } catch {
    return false;
  }
}
