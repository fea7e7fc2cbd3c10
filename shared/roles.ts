export const ROLES = ['admin', 'receiving', 'operator', 'quality', 'supervisor', 'shipping', 'warranty'] as const;

export type Role = (typeof ROLES)[number];

/** Roles that work a shift on the floor, often on a shared tablet: their sessions idle for a shift. */
export const FLOOR_ROLES: readonly Role[] = ['receiving', 'operator', 'shipping'];

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Administrator',
  receiving: 'Receiving',
  operator: 'Station operator',
  quality: 'Quality engineer',
  supervisor: 'Supervisor',
  shipping: 'Shipping',
  warranty: 'Warranty desk',
};

/**
 * What each role does in Coretrail today, shown on its home page. Only what a screen exists for:
 * a promise of a screen not yet built is added here with that screen, not before.
 */
export const ROLE_SUMMARIES: Record<Role, string> = {
  admin:
    'Keeps people, roles, stations, engine families, defect codes and the plant’s settings in order, and checks the audit trail.',
  receiving: 'Logs every core at the dock, accepts or rejects it, decides core credit and prints its label.',
  operator: 'Scans a part at the station, records the readings and results, and sees at once what is out of tolerance.',
  quality: 'Owns the spec book, dispositions nonconformances, and watches control charts and capability.',
  supervisor:
    'Keeps the line moving: records and corrects station results, allows a sanctioned re-entry of a stage, and sees NCRs, holds and control charts.',
  shipping: 'Releases finished engines that pass the release gate and records each shipment.',
  warranty: 'Looks up any serial for its whole history, and follows the field actions on units already shipped.',
};
