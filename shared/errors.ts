/**
 * The one vocabulary of refusals: every error reply's `code` is one of these, each with its one
 * HTTP status. The server builds replies from it (server/errors.ts) and the client chooses its
 * words by it. A 409 `conflict` says which rule stopped it in `reason` (CONFLICT_REASONS).
 */
export const ERROR_CODES = {
  // the request itself
  invalid: { status: 400, meaning: 'Some fields need attention (per-field notes in `fields`).' },
  malformed_json: { status: 400, meaning: 'The body is not JSON.' },
  malformed_path: { status: 400, meaning: 'The address has a broken percent-escape.' },
  invalid_upload: { status: 400, meaning: 'An upload was cut short or sent in the wrong field.' },
  invalid_csv: { status: 400, meaning: 'A run-test CSV file could not be read.' },
  bad_request: { status: 400, meaning: 'The web server refused the request before Coretrail read it.' },
  gauge_unsuitable: { status: 400, meaning: 'A chosen gauge cannot measure the characteristic.' },
  // who is asking
  unauthenticated: { status: 401, meaning: 'No session, or it has ended.' },
  sign_in_failed: { status: 401, meaning: 'E-mail address and password do not match an active account.' },
  code_required: { status: 401, meaning: 'The account needs its second-factor code.' },
  code_refused: { status: 401, meaning: 'The second-factor code is not right.' },
  wrong_password: { status: 400, meaning: 'The person’s own password, asked again, is not right.' },
  signature_refused: { status: 400, meaning: 'The password given to sign does not match.' },
  pin_refused: { status: 400, meaning: 'Badge and PIN do not match.' },
  forbidden: { status: 403, meaning: 'The role does not allow this.' },
  not_qualified: { status: 403, meaning: 'The operator is not qualified (or no longer) for this station.' },
  second_factor_required: { status: 403, meaning: 'An administrator must set up a second factor first.' },
  cross_site: { status: 403, meaning: 'A change came from a page that is not Coretrail’s.' },
  // what it is about
  not_found: { status: 404, meaning: 'No such record.' },
  conflict: { status: 409, meaning: 'A rule of the trade stops this now (`reason` says which).' },
  duplicate: { status: 409, meaning: 'Another record already has this code, serial or address.' },
  reference: { status: 409, meaning: 'A record refers to, or is referred to by, another.' },
  build_refused: { status: 409, meaning: 'The long block cannot be started with these parts (per part in `fields`).' },
  replace_refused: { status: 409, meaning: 'The part cannot be replaced in the unit (reasons in `fields`).' },
  not_releasable: { status: 409, meaning: 'The unit does not pass the release gate.' },
  not_released: { status: 409, meaning: 'Documents are issued at release, and the unit has not been released.' },
  not_closable: { status: 409, meaning: 'A corrective action still has open steps.' },
  lot_exists: { status: 409, meaning: 'The supplier’s lot of this part number was already received.' },
  not_yet_in_log: { status: 409, meaning: 'The audit log has not yet sealed the event asked about.' },
  idempotency_key_reused: { status: 422, meaning: 'An idempotency key came back with a different submission.' },
  // what was sent
  too_large: { status: 413, meaning: 'The body or file is larger than allowed.' },
  not_an_image: { status: 415, meaning: 'An upload is not a photo of a kind Coretrail keeps.' },
  not_a_pdf: { status: 415, meaning: 'An upload is not a PDF.' },
  unsupported_media_type: { status: 415, meaning: 'The body is not UTF-8 JSON, or not of a type this route takes.' },
  // how often
  too_many: { status: 429, meaning: 'Too many tries: wait before the next.' },
  upload_quota: { status: 429, meaning: 'A person’s uploads for the day are used up.' },
  // the server
  internal: { status: 500, meaning: 'A fault on Coretrail’s side; the request id finds it in the log.' },
  unavailable: { status: 503, meaning: 'The database cannot be reached right now; try again after Retry-After.' },
  shutting_down: { status: 503, meaning: 'The server is stopping; try again shortly.' },
} as const satisfies Record<string, { status: number; meaning: string }>;

export type ErrorCode = keyof typeof ERROR_CODES;

/**
 * Codes the client gives a failure no reply explains: no network (`network`), a station tablet
 * asked to record before anyone identified (`identify_first`), a reply that was not Coretrail's
 * (`http_502`).
 */
export type ClientErrorCode = 'network' | 'identify_first' | `http_${number}`;

export const isErrorCode = (code: string): code is ErrorCode => Object.hasOwn(ERROR_CODES, code);

export const statusOf = (code: ErrorCode): number => ERROR_CODES[code].status;

/** Which rule stopped a `conflict`, where the client acts on it rather than only showing the message. */
export const CONFLICT_REASONS = [
  'actions_open', // a corrective action has open actions
  'already_approved', // the draft was approved meanwhile
  'already_recorded', // the stage has a result already
  'badge_taken', // another person has this badge
  'claim_open', // a warranty claim on the unit is open
  'closed', // the record is closed
  'done', // the step was done already
  'duplicate', // a look-alike record exists (the reply lists it)
  'empty', // nothing to act on
  'invalid_transition', // the lifecycle does not allow this step from here
  'needs_reason', // a reason must be given
  'no_customers', // nobody to notify
  'no_rule', // no rule in force for the characteristic
  'no_verification_day', // a verification day is missing
  'not_closable', // the record cannot close yet
  'not_current', // only the current result can be corrected
  'not_returned', // the unit has not come back
  'not_shipped', // the unit was never shipped
  'not_torn_down', // the unit has not been torn down
  'possible_duplicate', // a core that looks like one already received
  'raised_by_result', // the NCR was raised by a result and closes through it
  'rehearsal_stale', // the draft changed after its rehearsal
  'returned', // the unit is back under a claim
  'rework_not_passed', // the rework stage has not been passed
  'same_signer', // a second signature must come from someone else
  'shipped', // the unit has shipped
  'too_early', // it is too early for this step
  // a station result out of the part's route (the form's `sequence.code` says the same)
  'out_of_sequence', // an earlier required stage is not done
  'on_hold', // the part is held
  'finished', // the part is through its route
  'wrong_part', // the stage is for another kind of part
  'not_on_route', // the stage is not on the part's route
  'scrapped', // the part was scrapped
] as const;

export type ConflictReason = (typeof CONFLICT_REASONS)[number];
