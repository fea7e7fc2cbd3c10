export type {
  Disposition,
  NcrAction,
  NcrDetail,
  NcrRow,
  NcrSignature,
  NcrState,
  NcrTimelineEntry,
  Severity,
} from '../../../shared/schemas/ncr';
