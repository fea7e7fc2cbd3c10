import { ROLES, type Role } from './roles.js';

/**
 * The one permission matrix. The server checks it on every route; the client uses it to decide
 * which areas to show. Each permission lists the roles that hold it.
 */
const everyone = ROLES;

export const PERMISSIONS = {
  // reference data every signed-in person reads (families, stages, stations)
  'reference.read': everyone,
  'account.self': everyone,

  'people.manage': ['admin'],
  'stations.manage': ['admin'],
  'families.manage': ['admin'],
  'plant.manage': ['admin'],
  'audit.read': ['admin', 'quality'],
  'audit.verify': ['admin'],

  'intake.read': ['receiving', 'supervisor', 'quality', 'warranty', 'admin'],
  'intake.record': ['receiving'],
  'teardown.record': ['receiving', 'operator', 'supervisor'],
  'labels.print': ['receiving', 'operator', 'supervisor', 'shipping'],
  'attachments.upload': ['receiving', 'operator', 'quality', 'supervisor'],

  'items.read': ['receiving', 'operator', 'quality', 'supervisor', 'shipping', 'warranty', 'admin'],
  'station.form': ['operator', 'supervisor', 'quality'],
  'results.record': ['operator', 'supervisor'],
  'results.correct': ['supervisor', 'quality'],
  'stage.reentry': ['supervisor'],
  // who may record which stage: supervisors and admins sign qualifications off, quality reads them
  'qualifications.read': ['supervisor', 'admin', 'quality'],
  'qualifications.manage': ['supervisor', 'admin'],

  // the plant's own process: admin and quality set up part kinds, stages, routes, characteristics and
  // casting numbers; a route change is approved by quality (never its author), who also moves a part
  // to another version of its route
  'process.edit': ['admin', 'quality'],
  'process.approve': ['quality'],

  'spec.read': ['quality', 'supervisor', 'operator', 'admin'],
  'spec.edit': ['quality'],
  'spec.approve': ['quality'],
  // control charts and capability; limits are frozen by quality, a signal's part held by either
  'spc.read': ['quality', 'supervisor'],
  'spc.freeze': ['quality'],
  'spc.hold': ['quality', 'supervisor'],

  'ncr.read': ['receiving', 'quality', 'supervisor', 'operator', 'shipping', 'warranty', 'admin'],
  'ncr.raise': ['receiving', 'operator', 'quality', 'supervisor', 'shipping', 'warranty'],
  'ncr.disposition': ['quality'],
  'defects.manage': ['quality', 'admin'],

  // purchased lots: receiving logs them and inspects them, quality may hold or accept them too; the
  // floor reads them to build
  'lots.read': ['receiving', 'operator', 'quality', 'supervisor', 'shipping', 'warranty', 'admin'],
  'lots.receive': ['receiving'],
  'lots.inspect': ['receiving', 'quality'],
  'assembly.record': ['operator', 'supervisor'],
  'release.check': ['shipping', 'quality', 'supervisor'],
  'release.ship': ['shipping'],
  'trail.read': ['warranty', 'quality', 'supervisor', 'shipping', 'admin'],
  'warranty.record': ['warranty'],
  // claims: the desk logs and decides them, receiving takes the unit back, the floor tears it down
  'warranty.read': ['warranty', 'quality', 'supervisor', 'receiving', 'operator', 'admin'],
  'warranty.return': ['receiving'],
  'warranty.teardown': ['operator', 'supervisor'],
  'warranty.analysis': ['warranty', 'quality', 'supervisor', 'admin'],
  'cause-codes.manage': ['quality', 'admin'],
  // a core's credit settled after its teardown (the dock's decision is kept beside it)
  'intake.revise-credit': ['receiving', 'supervisor'],
  // corrective actions: quality runs them; anyone may own an action in one
  'corrective-actions.read': everyone,
  'corrective-actions.manage': ['quality'],
  // problems found after a unit shipped: the warranty desk follows them, quality decides them
  'field-actions.read': ['warranty', 'quality', 'supervisor', 'shipping', 'admin'],
  'field-actions.decide': ['quality'],
  // the gauge register and calibrations; the blast radius of a bad gauge, lot, rule, person or station
  'gauges.read': ['quality', 'supervisor', 'operator', 'admin'],
  'gauges.manage': ['quality'],
  'containment.read': ['quality', 'supervisor', 'warranty'],
  'containment.act': ['quality'],
  'mail.read': ['admin'],
  // the line in view: work in process and queues on the homes; yields and the NCR Pareto
  'wip.read': ['operator', 'supervisor', 'quality', 'shipping', 'receiving', 'admin'],
  'yields.read': ['quality', 'supervisor', 'admin'],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

export const PERMISSION_NAMES = Object.keys(PERMISSIONS) as Permission[];

export function can(role: Role | null | undefined, permission: Permission): boolean {
  if (!role) return false;
  return (PERMISSIONS[permission] as readonly Role[]).includes(role);
}

export function permissionsOf(role: Role): Permission[] {
  return PERMISSION_NAMES.filter((p) => can(role, p));
}
