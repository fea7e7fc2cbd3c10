import type { CaState, TaskJson } from '../../../shared/schemas/corrective-action';
import { Badge } from '../../components/ui/badge';
import { claimHref, ncrHref } from '../../lib/paths';

export function CaStateBadge({ state }: { state: CaState }) {
  return state === 'closed' ? <Badge tone="ok">Closed</Badge> : <Badge tone="wait">Open</Badge>;
}

/** An action's state: done, overdue, or due on its day. */
export function TaskStateBadge({ t }: { t: Pick<TaskJson, 'doneAt' | 'overdue' | 'dueOn'> }) {
  if (t.doneAt) return <Badge tone="ok">Done</Badge>;
  if (t.overdue) return <Badge tone="bad">Overdue</Badge>;
  return <Badge tone="wait">Open</Badge>;
}

/** A source's number goes to its own page: NC-… to the NCR, WC-… to the claim. */
export const sourceHref = (number: string) => (number.startsWith('WC-') ? claimHref(number) : ncrHref(number));
