import type { Permission } from '../../../shared/permissions';
import { can } from '../../../shared/permissions';
import type { Role } from '../../../shared/roles';
import { paths } from '../../lib/paths';

/**
 * The areas that exist today. Each declares the permission it needs; navigation and the home
 * cards both come from this list, filtered through the shared permission matrix.
 */
export type Area = {
  label: string;
  to: string;
  permission: Permission;
  summary: string;
  /** A home card only: the task sits inside another area's navigation entry. */
  homeOnly?: boolean;
};

export const AREAS: Area[] = [
  {
    label: 'Station',
    to: paths.station,
    permission: 'station.form',
    summary: 'Scan a part, record its readings and results, and see at once what is out of tolerance.',
  },
  {
    label: 'Receive a core',
    to: paths.receiveCore,
    permission: 'intake.record',
    summary: 'Log a core at the dock: numbers, source, condition, grade, photos; accept or reject it.',
    homeOnly: true,
  },
  {
    label: 'Intake',
    to: paths.intake,
    permission: 'intake.read',
    summary: 'Every core received or rejected, with its source, grade and core credit; filter and export.',
  },
  {
    label: 'Teardown',
    to: paths.teardown,
    permission: 'teardown.record',
    summary: 'Scan a received core and split it into serialized parts, each linked to the core it came from.',
  },
  {
    label: 'Labels',
    to: paths.labels,
    permission: 'labels.print',
    summary: 'Print QR labels for cores and parts on 2×1 in or 50×25 mm stock; reprints are logged.',
  },
  {
    label: 'People',
    to: paths.people,
    permission: 'people.manage',
    summary: 'Add people, set their role, reset a password, deactivate someone who has left.',
  },
  {
    label: 'Qualifications',
    to: paths.qualifications,
    permission: 'qualifications.read',
    summary: 'Who may record which stage: training and expiry days, signed off by a supervisor.',
  },
  {
    label: 'Stations',
    to: paths.stations,
    permission: 'stations.manage',
    summary: 'The stations on the floor, the stage each one records, and which are in service.',
  },
  {
    label: 'Plant',
    to: paths.plant,
    permission: 'plant.manage',
    summary: 'The plant’s name and address for documents, and its time zone: the calendar dates are kept in.',
  },
  {
    label: 'Process',
    to: paths.process,
    permission: 'process.edit',
    summary: 'The part kinds, stages and characteristics the plant works with; retired, never deleted.',
  },
  {
    label: 'Routes',
    to: paths.routes,
    permission: 'process.edit',
    summary: "Each family's routes version by version, drafted, approved with a signature, compared side by side.",
  },
  {
    label: 'Process document',
    to: paths.processDocument,
    permission: 'process.edit',
    summary: 'The whole process definition as one JSON file: download it, or import one as a draft to approve.',
  },
  {
    label: 'Customers and suppliers',
    to: paths.parties,
    permission: 'process.edit',
    summary: 'Who returns cores and buys engines, and who sells cores and purchased lots.',
  },
  {
    label: 'Engine families',
    to: paths.families,
    permission: 'families.manage',
    summary: 'Layout, cylinders, bore and stroke, heads and warranty term for each family.',
  },
  {
    label: 'Purchased lots',
    to: paths.receivedLots,
    permission: 'lots.read',
    summary: 'Lots of new parts as received: what is left, the certificate, and whether a build may draw from them.',
  },
  {
    label: 'Build',
    to: paths.build,
    permission: 'assembly.record',
    summary: 'Start a long block from a finished block, crankshaft and heads plus purchased lots.',
  },
  {
    label: 'Release',
    to: paths.release,
    permission: 'release.check',
    summary: 'See exactly what keeps a unit from shipping; release it and record the shipment.',
  },
  {
    label: 'Trail',
    to: paths.trail,
    permission: 'trail.read',
    summary: 'Look up any serial or lot code: genealogy, every reading and decision, shipment and warranty.',
  },
  {
    label: 'Gauges',
    to: paths.gauges,
    permission: 'gauges.read',
    summary:
      'The gauge register: calibration due dates in the plant’s calendar, calibration records, what a bad gauge touched.',
  },
  {
    label: 'Field actions',
    to: paths.fieldActions,
    permission: 'field-actions.read',
    summary: 'Problems found after a unit shipped: which customer has it, and what quality decided to do.',
  },
  {
    label: 'Warranty claims',
    to: paths.warrantyClaims,
    permission: 'warranty.read',
    summary: 'Claims by serial with their coverage; the unit taken back, torn down, decided and closed.',
  },
  {
    label: 'Log a claim',
    to: paths.logClaim,
    permission: 'warranty.record',
    summary: 'A customer reports a failure: scan the serial, see at once whether it is covered, and log it.',
    homeOnly: true,
  },
  {
    label: 'Warranty analysis',
    to: paths.warrantyAnalysis,
    permission: 'warranty.analysis',
    summary: 'Claim rates by family, build month, lot, core, station, gauge and operator; Weibull of time to failure.',
  },
  {
    label: 'Corrective actions',
    to: paths.correctiveActions,
    permission: 'corrective-actions.read',
    summary: 'Problems answered once for many NCRs and claims: root cause, actions with owners, proof it worked.',
  },
  {
    label: 'Raise a concern',
    to: paths.raiseConcern,
    permission: 'ncr.raise',
    summary: 'Seen something wrong with a part? Scan it, say what you saw, add a photo: it goes on hold.',
    homeOnly: true,
  },
  {
    label: 'NCRs',
    to: paths.ncrs,
    permission: 'ncr.read',
    summary: 'Every nonconformance, filtered by state, severity, defect, family, stage, age or assignee.',
  },
  {
    label: 'Spec book',
    to: paths.specBook,
    permission: 'spec.read',
    summary: 'Tolerance rules per engine family, stage and characteristic: drafts, signed approvals, every version.',
  },
  {
    label: 'Control charts',
    to: paths.spc,
    permission: 'spc.read',
    summary: 'Control charts and capability of measured characteristics; freeze limits, see run-rule signals.',
  },
  {
    label: 'Work in process',
    to: paths.wip,
    permission: 'wip.read',
    summary: 'Every part on the floor by stage and station: waiting, in work, on hold, with ages; throughput.',
  },
  {
    label: 'Yields',
    to: paths.yields,
    permission: 'yields.read',
    summary: 'First-pass and rolled throughput yield, scrap, rework, salvage and the NCR Pareto, with CSV.',
  },
  {
    label: 'Defect codes',
    to: paths.defectCodes,
    permission: 'defects.manage',
    summary: 'The plant’s list of defect codes for NCRs: add, reword, retire.',
  },
  {
    label: 'Cause codes',
    to: paths.causeCodes,
    permission: 'cause-codes.manage',
    summary: 'The plant’s list of causes for teardown findings, and which of them count as failures.',
    homeOnly: true,
  },
  {
    label: 'Mail',
    to: paths.mail,
    permission: 'mail.read',
    summary: 'What Coretrail has queued and sent, and what the local mail sink received.',
  },
  {
    label: 'Audit trail',
    to: paths.audit,
    permission: 'audit.read',
    summary: 'Every change, who made it and when, with what it was before and after.',
  },
];

export const areasFor = (role: Role) => AREAS.filter((a) => can(role, a.permission));
export const navAreasFor = (role: Role) => areasFor(role).filter((a) => !a.homeOnly);

/** Work that is planned but not built; a role sees an entry when it holds any of its permissions. */
export type Coming = { label: string; permissions: Permission[]; summary: string };

export const COMING: Coming[] = [];

export const comingFor = (role: Role) => COMING.filter((c) => c.permissions.some((p) => can(role, p)));
