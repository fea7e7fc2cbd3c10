import {
  CLAIM_DECISION_LABELS,
  CLAIM_STATE_LABELS,
  type ClaimDecision,
  type ClaimNext,
  type ClaimState,
} from '../../../shared/schemas/warranty';
import { Badge, type Tone } from '../../components/ui/badge';

const STATE_TONE: Record<ClaimState, Tone> = {
  received: 'wait',
  torn_down: 'hold',
  decided: 'accent',
  closed: 'neutral',
};

export function ClaimStateBadge({ state }: { state: ClaimState }) {
  return <Badge tone={STATE_TONE[state]}>{CLAIM_STATE_LABELS[state]}</Badge>;
}

export function CoveredBadge({ covered }: { covered: boolean }) {
  return covered ? <Badge tone="ok">Covered</Badge> : <Badge tone="bad">Not covered</Badge>;
}

const DECISION_TONE: Record<ClaimDecision, Tone> = { accepted: 'ok', rejected: 'bad', goodwill: 'accent' };

export function DecisionBadge({ decision }: { decision: ClaimDecision }) {
  return <Badge tone={DECISION_TONE[decision]}>{CLAIM_DECISION_LABELS[decision]}</Badge>;
}

/** What the claim waits for, in words, and whose step it is. */
export const NEXT_WORDS: Record<Exclude<ClaimNext, null>, string> = {
  return: 'Receiving takes the unit back',
  teardown: 'Tear the returned unit down',
  decide: 'The warranty desk decides',
  close: 'The warranty desk closes it',
};

export const distanceWords = (km: number | null, hours: number | null) =>
  [
    km !== null ? `${km.toLocaleString('en-US')} km` : null,
    hours !== null ? `${hours.toLocaleString('en-US')} h` : null,
  ]
    .filter(Boolean)
    .join(' · ') || '—';

/** Days in service as months and days, as the desk says it on the phone. */
export function inServiceWords(days: number) {
  const months = Math.floor(days / (365.25 / 12));
  return `${days.toLocaleString('en-US')} days (${months} month${months === 1 ? '' : 's'})`;
}
