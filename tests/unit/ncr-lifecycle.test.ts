import { describe, expect, it } from 'vitest';
import { NCR_LIFECYCLE, ncrActionsOpen, personMayTake, stepOpen } from '../../shared/domain/ncr-lifecycle.js';
import { NCR_STATES } from '../../shared/schemas/ncr.js';

/**
 * The NCR's life as the plant runs it (our own workflow; the states and the second signature for a
 * critical use-as-is are common practice for material review): every state against every person.
 */
const ncr = (state: string, awaitingSecondSignature = false, decidedById: number | null = null) => ({
  state,
  awaitingSecondSignature,
  decidedById,
});

describe('the NCR lifecycle table', () => {
  it('when quality looks at an NCR in each state, then the steps open are the workflow’s, in order', () => {
    expect(ncrActionsOpen(ncr('raised'), 'quality', 7)).toEqual(['review', 'void']);
    expect(ncrActionsOpen(ncr('in_review'), 'quality', 7)).toEqual(['disposition', 'void']);
    expect(ncrActionsOpen(ncr('decided'), 'quality', 7)).toEqual(['close']);
    expect(ncrActionsOpen(ncr('closed'), 'quality', 7)).toEqual([]);
    expect(ncrActionsOpen(ncr('voided'), 'quality', 7)).toEqual([]);
  });

  it('when a critical use-as-is waits for its second signature, then only another person may countersign', () => {
    const waiting = ncr('in_review', true, 7);
    expect(ncrActionsOpen(waiting, 'quality', 8)).toEqual(['countersign', 'void']);
    expect(ncrActionsOpen(waiting, 'quality', 7)).toEqual(['void']);
    // the NCR admits the step; the first signer may not take it
    expect(stepOpen(waiting, 'countersign')).toBe(true);
    expect(personMayTake(waiting, 'countersign', 7)).toBe(false);
    expect(stepOpen(waiting, 'disposition')).toBe(false);
  });

  it('when someone without the permission to decide looks, then no step is open in any state', () => {
    for (const role of ['operator', 'receiving', 'shipping', 'warranty'] as const) {
      for (const state of NCR_STATES) expect(ncrActionsOpen(ncr(state), role, 1)).toEqual([]);
    }
    expect(ncrActionsOpen(ncr('raised'), undefined, 1)).toEqual([]);
  });

  it('when a step is taken, then it leads forward: nothing leads back to raised, and closed and voided are ends', () => {
    for (const [action, step] of Object.entries(NCR_LIFECYCLE)) {
      expect(step.to, action).not.toBe('raised');
      expect(step.from, action).not.toContain('closed');
      expect(step.from, action).not.toContain('voided');
      for (const from of step.from)
        expect(NCR_STATES.indexOf(step.to), action).toBeGreaterThan(NCR_STATES.indexOf(from));
    }
  });
});
