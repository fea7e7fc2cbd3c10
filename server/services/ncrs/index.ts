/**
 * Nonconformances, one job to a file: raising (`raise.ts`), the list (`list.ts`), the detail
 * (`present.ts`), the steps of the workflow (`workflow.ts`, on the guards and transitions of
 * `steps.ts`, which follow the table in shared/domain/ncr-lifecycle.ts), what a decision does to
 * the part (`outcome.ts`), the holds an open NCR puts on a part (`holds.ts`) and the mail
 * (`mail.ts`). Defect codes are services/defect-codes.ts.
 */
export { NCR_STATE_LABELS, OPEN_NCR_STATES } from '../../../shared/schemas/ncr.js';
export { blockingNcrsOf, openNcrsOf, subjectOf } from './holds.js';
export { listNcrs, ncrListSql } from './list.js';
export { ncrDetail } from './present.js';
export { raiseConcern, raiseNonconformance, type FailingReading } from './raise.js';
export {
  assignNcr,
  closeNcr,
  countersign,
  disposition,
  settleRework,
  startReview,
  updateContainment,
  voidNcr,
} from './workflow.js';
