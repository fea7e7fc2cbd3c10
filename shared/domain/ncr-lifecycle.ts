import { can } from '../permissions.js';
import type { Role } from '../roles.js';
import { NCR_ACTIONS, type NcrAction, type NcrState } from '../schemas/ncr.js';

/**
 * An NCR's life as one table: each step, the states it starts from, where it leads, what else
 * must hold of the NCR, and what must hold of the person taking it. The server's steps guard on it,
 * the list of steps open to a person is read from it, and the client's buttons are that list (the
 * NCR's detail carries it). raised → in_review → decided → closed, or voided when raised in error.
 */

/** What a step needs to know of an NCR. */
export type NcrStanding = {
  state: NcrState | string;
  awaitingSecondSignature: boolean;
  decidedById: number | null;
};

export type NcrStep = {
  from: readonly NcrState[];
  /**
   * Where the step leads. A disposition leads to decided, except that a critical use-as-is stays
   * in review for a second signature; a decided scrap or use-as-is closes at once.
   */
  to: NcrState;
  /** A further condition on the NCR. */
  when?: (n: NcrStanding) => boolean;
  /** A condition on the person, besides the permission every step needs. */
  by?: (n: NcrStanding, userId: number | undefined) => boolean;
};

/** The permission every step needs. */
export const NCR_STEP_PERMISSION = 'ncr.disposition' as const;

export const NCR_LIFECYCLE: Record<NcrAction, NcrStep> = {
  review: { from: ['raised'], to: 'in_review' },
  disposition: { from: ['in_review'], to: 'decided', when: (n) => !n.awaitingSecondSignature },
  countersign: {
    from: ['in_review'],
    to: 'decided',
    when: (n) => n.awaitingSecondSignature,
    // a critical use-as-is needs a second quality engineer
    by: (n, userId) => n.decidedById !== userId,
  },
  close: { from: ['decided'], to: 'closed' },
  void: { from: ['raised', 'in_review'], to: 'voided' },
};

/** Whether the NCR, as it stands, admits the step (whoever takes it). */
export function stepOpen(n: NcrStanding, action: NcrAction): boolean {
  const step = NCR_LIFECYCLE[action];
  return (step.from as readonly string[]).includes(n.state) && (step.when?.(n) ?? true);
}

/** Whether this person may take the step the NCR admits. */
export function personMayTake(n: NcrStanding, action: NcrAction, userId: number | undefined): boolean {
  return NCR_LIFECYCLE[action].by?.(n, userId) ?? true;
}

/** The steps open to this person now, in the table's order. */
export function ncrActionsOpen(n: NcrStanding, role: Role | undefined, userId?: number): NcrAction[] {
  if (!role || !can(role, NCR_STEP_PERMISSION)) return [];
  return NCR_ACTIONS.filter((a) => stepOpen(n, a) && personMayTake(n, a, userId));
}
