import type { FieldActionJson } from '../../../shared/schemas/field-actions';
import { FIELD_ACTION_DECISION_LABELS } from '../../../shared/schemas/field-actions';
import { Badge } from '../../components/ui/badge';

/** Open: waiting for quality's decision (a hold mark). Closed: the decision in words. */
export function FieldActionBadge({ fa }: { fa: Pick<FieldActionJson, 'state' | 'decision'> }) {
  if (fa.state === 'open') return <Badge tone="hold">Open: waiting for a decision</Badge>;
  return (
    <Badge tone={fa.decision === 'recall' ? 'bad' : 'off'}>
      Closed: {FIELD_ACTION_DECISION_LABELS[fa.decision!].toLowerCase()}
    </Badge>
  );
}
