import { Badge } from '../../components/ui/badge';

/** A critical characteristic: its failure matters beyond the part (safety, function). Word first. */
export function CriticalMark() {
  return (
    <Badge tone="accent" icon="alert">
      Critical
    </Badge>
  );
}
