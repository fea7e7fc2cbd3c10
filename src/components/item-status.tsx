import { itemStatus } from '../lib/item-status';
import { label } from '../lib/server-messages';
import { Badge } from './ui/badge';

export function StatusBadge({ status }: { status: string }) {
  const s = itemStatus(status);
  return <Badge tone={s.tone}>{label(s.label)}</Badge>;
}
