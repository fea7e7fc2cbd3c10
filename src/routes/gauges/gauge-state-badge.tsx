import { GAUGE_STATE_LABELS, type GaugeJson } from '../../../shared/schemas/gauges';
import { Badge, type Tone } from '../../components/ui/badge';

const TONES: Record<GaugeJson['state'], Tone> = {
  in_use: 'ok',
  due: 'wait',
  overdue: 'bad',
  never_calibrated: 'off',
  out_for_calibration: 'off',
  out_of_tolerance: 'bad',
  retired: 'neutral',
};

/** A gauge's state in a word, a colour and a shape. */
export function GaugeStateBadge({ gauge }: { gauge: Pick<GaugeJson, 'state'> }) {
  return <Badge tone={TONES[gauge.state]}>{GAUGE_STATE_LABELS[gauge.state]}</Badge>;
}
