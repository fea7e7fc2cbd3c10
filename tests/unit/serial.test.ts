import { describe, expect, it } from 'vitest';
import { checkCharacter, hasValidCheck, MOD_11_2, MOD_37_2 } from '../../shared/domain/check-character.js';
import { formatSerial, makeSerial, parseSerial, SERIAL_ALPHABET, SERIAL_PREFIX } from '../../shared/domain/serial.js';
import type { PartKind } from '../../shared/schemas/reference.js';

// a fixed pseudo-random sequence, so the sample of serials is the same on every run
function lcg(seed: number) {
  let s = seed;
  return (n: number) => {
    s = (s * 1103515245 + 12345) % 2 ** 31;
    return Math.floor((s / 2 ** 31) * n); // high bits: the low bits of this generator repeat quickly
  };
}

describe('ISO/IEC 7064 pure systems', () => {
  it('MOD 11-2: "079" → X (the standard\'s worked example)', () => {
    expect(checkCharacter('079', MOD_11_2)).toBe('X');
  });
  it('MOD 11-2: ORCID 0000-0002-1825-009 → 7 (published by ORCID)', () => {
    expect(checkCharacter('000000021825009', MOD_11_2)).toBe('7');
    expect(hasValidCheck('0000000218250097', MOD_11_2)).toBe(true);
  });
  it('MOD 37-2: "G123489654321" → Y (python-stdnum documentation, from memory)', () => {
    expect(checkCharacter('G123489654321', MOD_37_2)).toBe('Y');
  });
});

describe('Coretrail serials', () => {
  const rand = lcg(20261201);
  const kinds = Object.keys(SERIAL_PREFIX) as PartKind[];
  const sample = Array.from({ length: 300 }, (_, i) => makeSerial(kinds[i % kinds.length]!, rand));

  it('look like BK-7KX4-P2MQ, never contain 0, 1, I or O, and parse back to their kind', () => {
    for (const [i, serial] of sample.entries()) {
      expect(serial).toMatch(/^[A-Z]{2}-[2-9A-HJ-NP-Z]{4}-[2-9A-HJ-NP-Z]{4}$/);
      expect(serial).not.toMatch(/[01IO]/);
      expect(parseSerial(serial)).toEqual({ ok: true, serial, kind: kinds[i % kinds.length] });
    }
  });

  it('forgive case, spaces and dashes', () => {
    const s = sample[0]!;
    expect(parseSerial(` ${s.toLowerCase().replace(/-/g, ' ')} `)).toMatchObject({ ok: true, serial: s });
  });

  it('catch every single substitution in the sample', () => {
    let tried = 0;
    const accepted: string[] = []; // one expect for 74,400 cases: an expect each is most of the time
    for (const serial of sample) {
      const compact = serial.replace(/-/g, '');
      for (let i = 2; i < compact.length; i++) {
        for (const ch of SERIAL_ALPHABET) {
          if (ch === compact[i]) continue;
          const wrong = compact.slice(0, i) + ch + compact.slice(i + 1);
          if (parseSerial(wrong).ok) accepted.push(wrong);
          tried++;
        }
      }
    }
    expect(accepted).toEqual([]);
    expect(tried).toBe(300 * 8 * 31);
  });

  it('catch every adjacent transposition in the sample', () => {
    let tried = 0;
    for (const serial of sample) {
      const c = serial.replace(/-/g, '');
      for (let i = 2; i < c.length - 1; i++) {
        if (c[i] === c[i + 1]) continue;
        const swapped = c.slice(0, i) + c[i + 1] + c[i] + c.slice(i + 2);
        expect(parseSerial(swapped).ok, swapped).toBe(false);
        tried++;
      }
    }
    expect(tried).toBeGreaterThan(300 * 6);
  });

  it('explain what is wrong', () => {
    expect(parseSerial('')).toEqual({ ok: false, reason: 'Enter or scan a serial.' });
    expect(parseSerial('BK-0KX4-P2MQ').ok).toBe(false);
    expect((parseSerial('BK-0KX4-P2MQ') as { reason: string }).reason).toMatch(/never contain 0, 1, I or O/);
    expect((parseSerial('BK-7KX4') as { reason: string }).reason).toMatch(/2 letters, then 8/);
    expect((parseSerial('ZZ-7KX4-P2MQ') as { reason: string }).reason).toMatch(/not the start/);
    expect(formatSerial('BK7KX4P2MK')).toBe('BK-7KX4-P2MK');
    // the example the messages and placeholders show is itself a valid serial
    expect(parseSerial('BK-7KX4-P2MK')).toEqual({ ok: true, serial: 'BK-7KX4-P2MK', kind: 'block' });
  });
});
