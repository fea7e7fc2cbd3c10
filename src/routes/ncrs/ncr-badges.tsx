import { DISPOSITION_LABELS, NCR_STATE_LABELS } from '../../../shared/schemas/ncr';
import type { Disposition, NcrState, Severity } from '../../api/ncrs/types';
import { Badge, type Tone } from '../../components/ui/badge';
import type { IconName } from '../../components/ui/icon';

/**
 * Open states hold the part (the hold mark); a decided NCR waits on the shop; closed and voided are
 * done. Closed is plain grey, never the green check of a pass: a closed NCR may have accepted a
 * crack or scrapped the part.
 */
const STATE_LOOK: Record<NcrState, { tone: Tone; icon?: IconName }> = {
  raised: { tone: 'hold' },
  in_review: { tone: 'wait' },
  decided: { tone: 'accent', icon: 'arrowRight' },
  closed: { tone: 'neutral', icon: 'neutral' },
  voided: { tone: 'off' },
};

export function NcrStateBadge({ state }: { state: NcrState }) {
  const look = STATE_LOOK[state];
  return (
    <Badge tone={look.tone} icon={look.icon}>
      {NCR_STATE_LABELS[state]}
    </Badge>
  );
}

export const SEVERITY_LABELS: Record<Severity, string> = { critical: 'Critical', major: 'Major', minor: 'Minor' };

/** Critical is the one that must catch the eye: a warning mark, a double outline and the word in bold. */
export function SeverityMark({ severity }: { severity: Severity }) {
  if (severity === 'critical') {
    return (
      <Badge tone="bad" icon="alert">
        <span className="font-semibold">Critical</span>
      </Badge>
    );
  }
  return <span className={severity === 'major' ? 'font-medium' : 'text-ink-soft'}>{SEVERITY_LABELS[severity]}</span>;
}

export const dispositionWord = (d: Disposition | null) => (d ? DISPOSITION_LABELS[d] : null);
