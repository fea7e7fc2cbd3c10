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

export const ROLE_SUMMARIES: Record<Role, string> = {
  admin: 'Keeps people, roles, stations and engine families in order, and checks the audit trail.',
  receiving: 'Logs every core at the dock, accepts or rejects it, decides core credit and prints its label.',
  operator: 'Scans a part at the station, records the readings and results, and sees at once what is out of tolerance.',
  quality: 'Owns the spec book, dispositions nonconformances and watches yield, scrap and capability.',
  supervisor: 'Watches work in process, holds and throughput per station; allows a sanctioned re-entry of a stage.',
  shipping: 'Releases finished engines that pass the release gate and records each shipment.',
  warranty: 'Looks up any serial for its whole history, keeps warranty status and logs claims.',
};
