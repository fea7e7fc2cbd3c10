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
    label: 'Stations',
    to: paths.stations,
    permission: 'stations.manage',
    summary: 'The stations on the floor, the stage each one records, and which are in service.',
  },
  {
    label: 'Engine families',
    to: paths.families,
    permission: 'families.manage',
    summary: 'Layout, cylinders, bore and stroke, heads and warranty term for each family.',
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

export const COMING: Coming[] = [
  {
    label: 'Station work',
    permissions: ['results.record'],
    summary: 'Scan a part, record its readings and results, and see at once what is out of tolerance.',
  },
  {
    label: 'Corrections',
    permissions: ['results.correct'],
    summary: 'Correct a recorded result with a reason; the original stays on record.',
  },
  {
    label: 'Stage re-entry',
    permissions: ['stage.reentry'],
    summary: 'Let a part go back through a stage it has already passed, with a reason.',
  },
  {
    label: 'Spec book',
    permissions: ['spec.read', 'spec.edit', 'spec.approve'],
    summary: 'Tolerance rules per engine family, stage and characteristic, versioned and approved.',
  },
  {
    label: 'NCRs',
    permissions: ['ncr.read', 'ncr.raise', 'ncr.disposition'],
    summary:
      'Raise a nonconformance and follow it to its disposition: use as is, rework, repair, scrap or return to supplier.',
  },
  {
    label: 'Assembly',
    permissions: ['assembly.record'],
    summary: 'Build a long block from finished parts and purchased lots; record torques and clearances.',
  },
  {
    label: 'Release',
    permissions: ['release.check', 'release.ship'],
    summary: 'See exactly what keeps a unit from shipping; release it and record the shipment.',
  },
  {
    label: 'Trail',
    permissions: ['trail.read'],
    summary: 'Look up any serial and follow its parts, readings and decisions back to the core.',
  },
  {
    label: 'Warranty claims',
    permissions: ['warranty.record'],
    summary: 'Log a claim and the teardown findings of a returned unit.',
  },
  {
    label: 'Mail outbox',
    permissions: ['mail.read'],
    summary: 'The messages Coretrail has sent or is waiting to send.',
  },
];

export const comingFor = (role: Role) => COMING.filter((c) => c.permissions.some((p) => can(role, p)));
