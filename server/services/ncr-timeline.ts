import type { NcrState, NcrTimelineEntry } from '../../shared/schemas/ncr.js';

/**
 * An NCR's history as a person reads it: each change of state and each signature in the order they
 * happened, every entry under its own person, time and words. A signature sorts before the step
 * it caused when both carry the same instant.
 */
export function ncrTimeline(
  steps: { at: Date; from: NcrState | null; to: NcrState; actor: string; reason: string }[],
  signatures: { signedAt: Date; printedName: string; meaning: string; reason: string }[],
): NcrTimelineEntry[] {
  return [
    ...steps.map((t) => ({
      at: t.at.toISOString(),
      kind: 'step' as const,
      from: t.from,
      to: t.to,
      actor: t.actor,
      reason: t.reason,
      meaning: null,
    })),
    ...signatures.map((g) => ({
      at: g.signedAt.toISOString(),
      kind: 'signature' as const,
      from: null,
      to: null,
      actor: g.printedName,
      reason: g.reason,
      meaning: g.meaning,
    })),
  ].sort((a, b) => a.at.localeCompare(b.at) || (a.kind === b.kind ? 0 : a.kind === 'signature' ? -1 : 1));
}
