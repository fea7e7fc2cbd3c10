import { itemStatus } from '../lib/item-status';
import { Badge } from './ui/badge';

export function StatusBadge({ status }: { status: string }) {
  const s = itemStatus(status);
  return <Badge tone={s.tone}>{s.label}</Badge>;
}
