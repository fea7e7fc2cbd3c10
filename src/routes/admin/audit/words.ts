import { SERIAL_PREFIX } from '../../../../shared/domain/serial';
import { PART_KIND_LABELS, type PartKind } from '../../../../shared/schemas/reference';

/**
 * The audit trail in plain words. Every entity and action the server records has a name here;
 * tests/unit/audit-words.test.ts reads the server's sources and fails when one is missing.
 */

/** What each kind of record is called, in the filter and in the record column. */
export const ENTITY_LABELS: Record<string, string> = {
  item: 'Cores, parts and units',
  nonconformance: 'NCRs',
  stage_result: 'Stage results',
  tolerance_rule: 'Spec rules',
  field_action: 'Field actions',
  part_lot: 'Purchased lots',
  spc_limits: 'Control limits',
  spc_signal: 'Control chart signals',
  attachment: 'Photos and files',
  user: 'People',
  station: 'Stations',
  engine_family: 'Engine families',
  defect_code: 'Defect codes',
  plant: 'Plant settings',
  address: 'Sign-in addresses',
  sign_in: 'Sign-ins to unknown accounts',
  gauge: 'Gauges',
  gauge_calibration: 'Gauge calibrations',
  gauge_study: 'Gauge studies',
  characteristic: 'Characteristics',
  containment: 'Containments',
  warranty_claim: 'Warranty claims',
  warranty_finding: 'Teardown findings',
  core_credit_revision: 'Core credit revisions',
  cause_code: 'Cause codes',
  corrective_action: 'Corrective actions',
};

/** One record of a kind, as a person would say it before its id. */
const ONE: Record<string, string> = {
  nonconformance: 'NCR',
  stage_result: 'Stage result',
  tolerance_rule: 'Spec rule',
  field_action: 'Field action',
  part_lot: 'Purchased lot',
  spc_limits: 'Control limits',
  spc_signal: 'Control chart signal',
  attachment: 'Photo',
  user: 'Person',
  station: 'Station',
  engine_family: 'Engine family',
  defect_code: 'Defect code',
  plant: 'Plant settings',
  address: 'Address',
  sign_in: 'Sign-in as',
};

/** The kind of item a serial names, from its prefix (shared/domain/serial.ts). */
function itemWord(serial: string): string {
  const prefix = serial.slice(0, 2).toUpperCase();
  const kind = (Object.keys(SERIAL_PREFIX) as PartKind[]).find((k) => SERIAL_PREFIX[k] === prefix);
  return kind ? PART_KIND_LABELS[kind] : 'Item';
}

/** "Core CR-…", "NCR N-…", "Stage result 1664", "Person 12": the kind in words, then its id. */
export function recordName(entity: string, entityId: string): string {
  if (entity === 'item') return `${itemWord(entityId)} ${entityId}`;
  return `${ONE[entity] ?? ENTITY_LABELS[entity] ?? entity.replace(/_/g, ' ')} ${entityId}`;
}

/** Plain words for every action Coretrail writes. */
export const ACTION_LABELS: Record<string, string> = {
  'gauge.registered': 'Gauge registered',
  'gauge.calibrated': 'Gauge calibration recorded',
  'gauge.status_changed': 'Gauge status changed',
  'gauge.studied': 'Gauge study recorded',
  'gauge_study.approved': 'Gauge study approved and signed',
  'characteristic.gauge_ratio_set': 'Gauge ratio relaxed, with a reason',
  'containment.opened': 'Containment signed: parts held',
  'containment.notice_drafted': 'Customer notice drafted',
  'warranty_claim.received': 'Warranty claim logged',
  'warranty_claim.unit_returned': 'Claimed unit taken back',
  'warranty_claim.torn_down': 'Claimed unit torn down',
  'warranty_claim.decided': 'Warranty claim decided',
  'warranty_claim.closed': 'Warranty claim closed',
  'item.returned': 'Came back from the field',
  'item.taken_out': 'Taken out of its unit',
  'item.torn_down': 'Torn down after a claim',
  'core.credit_revised': 'Core credit revised',
  'cause_code.created': 'Cause code added',
  'cause_code.updated': 'Cause code changed',
  'corrective_action.opened': 'Corrective action opened',
  'corrective_action.updated': 'Corrective action changed',
  'corrective_action.source_added': 'NCR or claim added to a corrective action',
  'corrective_action.team_set': 'Corrective action team set',
  'corrective_action.containment_linked': 'Containment linked to a corrective action',
  'corrective_action.evidence_attached': 'Evidence attached to a corrective action',
  'corrective_action.action_added': 'Action added, with its owner and due date',
  'corrective_action.action_done': 'Action done',
  'corrective_action.verified': 'Corrective action checked for effect',
  'corrective_action.closed': 'Corrective action closed',
  'user.created': 'Person added',
  'user.updated': 'Person changed',
  'user.deactivated': 'Person deactivated',
  'user.password_reset': 'Password set by an administrator',
  'user.password_changed': 'Own password changed',
  'user.signed_in': 'Signed in',
  'user.signed_out': 'Signed out',
  'user.sessions_ended': 'Sessions ended',
  'user.lockout_lifted': 'Sign-in lock lifted',
  'user.recovery_code_used': 'Signed in with a recovery code',
  'user.second_factor_started': 'Second factor set-up started',
  'user.second_factor_enrolled': 'Second factor set up',
  'user.second_factor_removed': 'Second factor removed',
  'user.second_factor_reset': 'Second factor reset by an administrator',
  'address.lockout_lifted': 'Sign-in lock of an address lifted',
  'station.created': 'Station added',
  'station.updated': 'Station changed',
  'family.created': 'Engine family added',
  'family.updated': 'Engine family changed',
  'plant.updated': 'Plant settings changed',
  'defect_code.created': 'Defect code added',
  'defect_code.updated': 'Defect code changed',
  'core.received': 'Core received and accepted',
  'core.rejected': 'Core received and rejected',
  'core.torn_down': 'Core torn down',
  'item.harvested': 'Part taken from a core',
  'item.moved': 'Moved on to the next stage',
  'item.held': 'Put on hold',
  'item.released_from_hold': 'Released from hold',
  'item.released_for_rework': 'Sent to rework',
  'item.reentry_allowed': 'Re-entry of a stage allowed',
  'item.scrapped': 'Scrapped',
  'item.sent_back': 'Sent back to the supplier',
  'item.installed': 'Fitted in a unit',
  'item.removed': 'Taken out of a unit',
  'unit.built': 'Unit built',
  'unit.part_replaced': 'Part replaced in a unit',
  'unit.released': 'Unit released and shipped',
  'label.printed': 'Label printed',
  'label.reprinted': 'Label printed again',
  'result.recorded': 'Stage result recorded',
  'result.corrected': 'Stage result corrected',
  'attachment.uploaded': 'Photo added',
  'attachment.discarded_unclaimed': 'Unused upload removed',
  'ncr.raised': 'NCR raised',
  'ncr.in_review': 'NCR taken into review',
  'ncr.decided': 'NCR decided',
  'ncr.closed': 'NCR closed',
  'ncr.voided': 'NCR voided',
  'ncr.assigned': 'NCR assigned',
  'ncr.containment': 'Containment recorded',
  'ncr.first_signature': 'Disposition signed',
  'ncr.second_signature': 'Disposition countersigned',
  'lot.received': 'Lot received',
  'lot.inspected': 'Lot inspection changed',
  'lot.drawn': 'Parts drawn from a lot into a unit',
  'lot.returned': 'Lot returned to the supplier',
  'lot.scrapped': 'Lot scrapped',
  'field_action.opened': 'Field action opened',
  'field_action.decided': 'Field action decided',
  'spec.draft_created': 'Rule draft started',
  'spec.draft_edited': 'Rule draft changed',
  'spec.draft_discarded': 'Rule draft discarded',
  'spec.rule_approved': 'Rule approved',
  'spec.rule_superseded': 'Rule replaced by a newer version',
  'spec.rule_rehearsed': 'Rule draft rehearsed on past readings',
  'spc.limits_frozen': 'Control limits frozen',
  'spc.limits_superseded': 'Control limits replaced',
  'spc.signal_raised': 'Control chart signal',
  'spc.signal_held': 'Held for a control chart signal',
  'document.issued': 'Document issued',
  'demo.seeded': 'Demo plant loaded',
};

/** The words for an action; one the list does not know yet reads as its code with spaces. */
export const actionWords = (code: string) => ACTION_LABELS[code] ?? code.replace(/[._]/g, ' ');
