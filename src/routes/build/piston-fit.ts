import { mmToIn } from '../../../shared/domain/units';
import { OVERSIZE_MATCH_IN } from '../../../shared/schemas/build';
import type { ItemResult } from '../../api/items/results';

/**
 * Pistons are made for an oversize bore; a block is honed to one. The server refuses a build whose
 * pistons and mean finished bore differ by more than the shared allowance; this reads the block's
 * current bore-and-hone result to say so before anything is sent.
 */
export const OVERSIZE_WARN_IN = OVERSIZE_MATCH_IN;

export type BoreFit = { serial: string; meanIn: number; standardIn: number; oversizeIn: number };

export function boreFit(serial: string, results: ItemResult[], boreMm: number): BoreFit | null {
  // newest first: the latest bore-and-hone result that no correction replaced
  const current = results.find((r) => r.stage.code === 'bore-hone' && r.supersededBy === null);
  const bores = (current?.readings ?? []).filter((r) => r.characteristic === 'bore' && r.value !== null);
  if (!bores.length) return null;
  const meanIn = bores.reduce((s, r) => s + r.value!, 0) / bores.length;
  const standardIn = mmToIn(boreMm);
  return { serial, meanIn, standardIn, oversizeIn: meanIn - standardIn };
}

/** "+0.030" or "standard". */
export const oversizeWords = (inches: number) =>
  Math.abs(inches) < 0.0005
    ? 'standard'
    : `${inches > 0 ? '+' : '−'}${Math.abs(inches).toFixed(4).replace(/0$/, '')} in`;
