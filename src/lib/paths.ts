import type { labelStocks } from '../../shared/schemas/intake';
import type { PartKind } from '../../shared/schemas/reference';

/** Every client path in one place; pages and links build URLs only through these. */
export const paths = {
  home: '/',
  signIn: '/sign-in',
  account: '/account',
  secondFactor: '/second-factor',
  people: '/admin/people',
  stations: '/admin/stations',
  qualifications: '/admin/qualifications',
  families: '/admin/families',
  process: '/admin/process',
  routes: '/admin/routes',
  processDocument: '/admin/process/document',
  parties: '/admin/parties',
  audit: '/admin/audit',
  intake: '/intake',
  receiveCore: '/intake/new',
  core: '/cores/:serial',
  item: '/items/:serial',
  teardown: '/teardown',
  labels: '/labels',
  station: '/station',
  tablet: '/tablet',
  specBook: '/spec',
  specRule: '/spec/:family/:characteristicId',
  ncrs: '/ncrs',
  ncr: '/ncrs/:number',
  raiseConcern: '/ncrs/new',
  mail: '/admin/mail',
  defectCodes: '/admin/defect-codes',
  build: '/build',
  release: '/release',
  trail: '/trail',
  lot: '/lots/:lotCode',
  receivedLots: '/receiving/lots',
  receiveLot: '/receiving/lots/new',
  receivedLot: '/receiving/lots/:id',
  fieldActions: '/field-actions',
  fieldAction: '/field-actions/:number',
  plant: '/admin/plant',
  verify: '/verify',
  spc: '/spc',
  warrantyClaims: '/warranty/claims',
  logClaim: '/warranty/claims/new',
  claim: '/warranty/claims/:number',
  warrantyAnalysis: '/warranty/analysis',
  weibull: '/warranty/weibull',
  causeCodes: '/admin/cause-codes',
  correctiveActions: '/corrective-actions',
  openCa: '/corrective-actions/new',
  ca: '/corrective-actions/:number',
  gauges: '/gauges',
  gauge: '/gauges/:code',
  gaugeStudies: '/gauges/:code/studies',
  blastRadius: '/blast-radius',
  wip: '/wip',
  yields: '/yields',
  search: '/search',
} as const;

/** Why the sign-in page was shown, so it can say so in plain words. */
export const SIGN_IN_NOTES = {
  'password-changed': 'Password changed — sign in again.',
  'signed-out': 'You are signed out.',
  expired: 'Your session has ended. Sign in again to carry on where you were.',
} as const;
export type SignInNote = keyof typeof SIGN_IN_NOTES;

export function signInHref({ next, note }: { next?: string; note?: SignInNote } = {}): string {
  const q = new URLSearchParams();
  if (next && safeNext(next) !== paths.home) q.set('next', next);
  if (note) q.set('note', note);
  const s = q.toString();
  return s ? `${paths.signIn}?${s}` : paths.signIn;
}

/**
 * Where to go after sign-in. Only a path on this site is accepted ("/x", not "//host" or
 * "https://…"), so a crafted link cannot bounce a fresh session to another origin.
 */
export function safeNext(raw: string | null | undefined): string {
  if (!raw || !raw.startsWith('/') || raw.startsWith('//') || raw.startsWith('/\\')) return paths.home;
  if (raw === paths.signIn || raw.startsWith(`${paths.signIn}?`)) return paths.home;
  return raw;
}

export const receivedLotHref = (id: number) => `/receiving/lots/${id}`;
export const gaugeHref = (code: string) => `/gauges/${encodeURIComponent(code)}`;
export const gaugeStudiesHref = (code: string) => `/gauges/${encodeURIComponent(code)}/studies`;
export const blastHref = (q: Record<string, string>) => `/blast-radius?${new URLSearchParams(q).toString()}`;
export const coreHref = (serial: string) => `/cores/${encodeURIComponent(serial)}`;
export const itemHref = (serial: string) => `/items/${encodeURIComponent(serial)}`;

/**
 * Where a scanned serial opens: a core's full receipt for those who may read intake, otherwise the
 * item page (an operator tearing down a core sees its route and parts, not the customer's terms).
 */
export const serialHref = (serial: string, kind: PartKind, canReadIntake: boolean) =>
  kind === 'core' && canReadIntake ? coreHref(serial) : itemHref(serial);

export const teardownHref = (serial?: string) =>
  serial ? `${paths.teardown}?serial=${encodeURIComponent(serial)}` : paths.teardown;

export type LabelStock = (typeof labelStocks)[number];

/** Serials stay readable in the address (dashes and letters need no escaping). */
export function labelsHref(serials: string[], stock?: LabelStock): string {
  const q = new URLSearchParams();
  if (serials.length) q.set('serials', serials.join(','));
  if (stock) q.set('stock', stock);
  const s = q.toString().replace(/%2C/g, ',');
  return s ? `${paths.labels}?${s}` : paths.labels;
}

export function auditHref(filter: { entity?: string; entityId?: string | number; actorId?: number } = {}): string {
  const q = new URLSearchParams();
  if (filter.entity) q.set('entity', filter.entity);
  if (filter.entityId !== undefined) q.set('entityId', String(filter.entityId));
  if (filter.actorId !== undefined) q.set('actorId', String(filter.actorId));
  const s = q.toString();
  return s ? `${paths.audit}?${s}` : paths.audit;
}

/** The station screen, optionally opened on a serial (a link from an item page, a scan elsewhere). */
export const stationHref = (serial?: string) =>
  serial ? `${paths.station}?serial=${encodeURIComponent(serial)}` : paths.station;

export const specBookHref = (family?: string, stage?: string) => {
  const q = new URLSearchParams();
  if (family) q.set('family', family);
  if (stage) q.set('stage', stage);
  const s = q.toString();
  return s ? `${paths.specBook}?${s}` : paths.specBook;
};

/** One rule's versions; `compare` picks the two shown side by side. */
export const specRuleHref = (family: string, characteristicId: number, compare?: [number, number]) =>
  `/spec/${encodeURIComponent(family)}/${characteristicId}${compare ? `?compare=${compare.join(',')}` : ''}`;

export const ncrHref = (number: string) => `/ncrs/${encodeURIComponent(number)}`;

/** Raise a concern, optionally about a part already in hand. */
export const raiseConcernHref = (serial?: string) =>
  serial ? `${paths.raiseConcern}?serial=${encodeURIComponent(serial)}` : paths.raiseConcern;

/** Start a long block, optionally with a part already scanned. */
export const buildHref = () => paths.build;
export const releaseHref = (serial?: string) =>
  serial ? `${paths.release}?serial=${encodeURIComponent(serial)}` : paths.release;
export const trailHref = (serial?: string) =>
  serial ? `${paths.trail}?serial=${encodeURIComponent(serial)}` : paths.trail;
export const lotHref = (lotCode: string) => `/lots/${encodeURIComponent(lotCode)}`;
export const buildRecordHref = (serial: string) => `/api/units/${encodeURIComponent(serial)}/build-record.pdf`;
export type Paper = 'a4' | 'letter';
const DOCUMENT_FILES = {
  build_record: 'build-record',
  certificate: 'certificate',
  packing_slip: 'packing-slip',
} as const;
/** An issued document's PDF on A4 or Letter. */
export const documentHref = (serial: string, kind: keyof typeof DOCUMENT_FILES, paper: Paper) =>
  `/api/units/${encodeURIComponent(serial)}/${DOCUMENT_FILES[kind]}.pdf?paper=${paper}`;
export const travellerHref = (serial: string, paper: Paper) =>
  `/api/items/${encodeURIComponent(serial)}/traveller.pdf?paper=${paper}`;
export const fieldActionHref = (number: string) => `/field-actions/${encodeURIComponent(number)}`;
export const claimHref = (number: string) => `/warranty/claims/${encodeURIComponent(number)}`;
export const logClaimHref = (serial?: string) =>
  serial ? `${paths.logClaim}?serial=${encodeURIComponent(serial)}` : paths.logClaim;
export const caHref = (number: string) => `/corrective-actions/${encodeURIComponent(number)}`;
/** Open a corrective action from claims and NCRs already in hand. */
export function openCaHref(from: { claims?: string[]; ncrs?: string[] } = {}): string {
  const q = new URLSearchParams();
  for (const c of from.claims ?? []) q.append('claim', c);
  for (const n of from.ncrs ?? []) q.append('ncr', n);
  const s = q.toString();
  return s ? `${paths.openCa}?${s}` : paths.openCa;
}

export const searchHref = (q: string) => `${paths.search}?${new URLSearchParams({ q })}`;
