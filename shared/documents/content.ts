/**
 * What each printed document is drawn from. The content is logged (its SHA-256 in a
 * `document.issued` audit event) and embedded in the PDF, so a reader can check the data, and
 * `npm run verify` can draw the pages again from it and compare. Every string is final: times are
 * already in the plant's zone and numbers already rounded, so drawing needs no clock, zone or locale.
 */
export const BUILD_RECORD_LAYOUT = 'build-record/1';
export const CERTIFICATE_LAYOUT = 'certificate/1';
export const PACKING_SLIP_LAYOUT = 'packing-slip/1';

export type DocPlant = { name: string; address: string; timeZone: string };

export type DocSignature = {
  signer: string;
  meaning: string;
  reason: string;
  /** ISO 8601 UTC, and the same moment as the plant's clock read it. */
  signedAt: string;
  signedAtLocal: string;
};

export type DocCommon = {
  documentNumber: string;
  issuedAt: string;
  issuedAtLocal: string;
  plant: DocPlant;
  unit: { serial: string; familyCode: string; familyName: string };
  customer: { code: string; name: string } | null;
  shipment: {
    reference: string;
    carrier: string | null;
    shipDate: string;
    warranty: string;
  } | null;
  /** The release signature: who released the unit, meaning, reason and time. Null on a draft. */
  release: DocSignature | null;
  links: { trail: string; verify: string };
};

export type DocTreeNode = {
  serial: string;
  kind: string;
  position: string | null;
  link: string | null;
  note: string | null;
  children: DocTreeNode[];
};

export type DocReading = {
  characteristic: string;
  position: string;
  /** The value as judged (rounded to the rule's resolution), or "pass"/"fail" for an attribute. */
  value: string;
  unit: string;
  limits: string;
  verdict: 'pass' | 'fail';
  rule: string;
};

export type DocStage = {
  serial: string;
  part: string;
  stage: string;
  station: string;
  operator: string;
  gauge: string;
  finishedAtLocal: string;
  verdict: 'pass' | 'fail';
  note: string | null;
  readings: DocReading[];
};

export type DocNcr = {
  number: string;
  on: string;
  severity: string;
  state: string;
  description: string;
  disposition: string | null;
  signatures: DocSignature[];
};

export type DocLot = {
  kind: string;
  supplier: string;
  partNumber: string;
  lotCode: string;
  quantity: number;
  note: string;
};

export type BuildRecordContent = DocCommon & {
  layout: typeof BUILD_RECORD_LAYOUT;
  genealogy: DocTreeNode;
  lots: DocLot[];
  stages: DocStage[];
  ncrs: DocNcr[];
  caution: string;
};

export type CertificateContent = DocCommon & {
  layout: typeof CERTIFICATE_LAYOUT;
  statement: string;
  checks: { label: string; ok: boolean }[];
  /** The build record issued with it, by number and content hash. */
  buildRecord: { documentNumber: string; contentHash: string };
  parts: { serial: string; kind: string }[];
};

export type PackingSlipContent = DocCommon & {
  layout: typeof PACKING_SLIP_LAYOUT;
  lines: { quantity: number; description: string; serial: string }[];
  notes: string[];
  certificate: { documentNumber: string };
};

export type DocumentContent = BuildRecordContent | CertificateContent | PackingSlipContent;
