export type {
  GaugeChoice,
  HoldJson,
  ReadingJson,
  ResultJson,
  SequenceCheck,
  StationFormJson,
} from '../../../shared/schemas/results';
export type { EvaluatedReading, FormCharacteristic } from '../../../shared/domain/evaluate';
export type { Position } from '../../../shared/domain/positions';
