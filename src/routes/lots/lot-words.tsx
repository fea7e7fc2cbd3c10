import type { InspectionState, ReceivedLotJson } from '../../../shared/schemas/lots';
import { INSPECTION_LABELS } from '../../../shared/schemas/lots';
import { Badge, type Tone } from '../../components/ui/badge';

const TONES: Record<InspectionState, Tone> = { pending: 'wait', accepted: 'ok', on_hold: 'hold', refused: 'bad' };

/** A lot's receiving inspection in a word, a colour and a shape. */
export function InspectionBadge({ state }: { state: InspectionState }) {
  return <Badge tone={TONES[state]}>{INSPECTION_LABELS[state]}</Badge>;
}

/**
 * "Also part no. MB-7700 (Dunmore Bearings)": a lot code alone does not say which lot is meant
 * when another part number or supplier uses the same code.
 */
export function SameCode({ lot }: { lot: Pick<ReceivedLotJson, 'sameCode' | 'lotCode'> }) {
  if (!lot.sameCode.length) return null;
  return (
    <span className="block text-sm text-hold">
      Code {lot.lotCode} is also on part no.{' '}
      {lot.sameCode.map((s, i) => (
        <span key={s.id}>
          {i > 0 && ', '}
          <span className="font-mono">{s.partNumber}</span> ({s.supplier})
        </span>
      ))}
    </span>
  );
}
