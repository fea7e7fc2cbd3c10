import type { Sequelize } from 'sequelize';
import {
  BUILD_RECORD_LAYOUT,
  CERTIFICATE_LAYOUT,
  PACKING_SLIP_LAYOUT,
  type BuildRecordContent,
  type CertificateContent,
  type DocCommon,
  type DocReading,
  type DocSignature,
  type DocStage,
  type DocTreeNode,
  type PackingSlipContent,
} from '../../shared/documents/content.js';
import { limitsText, readingText } from '../../shared/documents/format.js';
import { LOT_KIND_LABELS, type LotKind } from '../../shared/schemas/build.js';
import { RELEASE_MEANING } from '../../shared/schemas/release.js';
import type { TrailJson, TrailNode } from '../../shared/schemas/trail.js';
import { DISPOSITION_LABELS, NCR_STATE_LABELS, type Disposition } from '../../shared/schemas/ncr.js';
import { PART_KIND_LABELS, type PartKind } from '../../shared/schemas/reference.js';
import { invalid } from '../errors.js';
import { appLink } from '../mail/links.js';
import { EngineFamily, Signature } from '../models/index.js';
import { plantSettings } from '../services/plant.js';
import { trailOf } from '../services/trail/index.js';
import { findBySerial } from '../services/items.js';

export const BUILD_RECORD_CAUTION =
  'Limits are those of the spec book version each reading was judged against. Specification values come from the plant’s own engineering documents; this record does not replace them.';

/** An instant on the plant's clock, "2026-12-03 14:05", with the zone named once in the header. */
export function localTime(timeZone: string, iso: string | Date): string {
  const parts = new Intl.DateTimeFormat('en-CA', {
    timeZone,
    year: 'numeric',
    month: '2-digit',
    day: '2-digit',
    hour: '2-digit',
    minute: '2-digit',
    hourCycle: 'h23',
  }).formatToParts(new Date(iso));
  const get = (t: string) => parts.find((p) => p.type === t)?.value ?? '';
  return `${get('year')}-${get('month')}-${get('day')} ${get('hour')}:${get('minute')}`;
}

const signatureOf = (
  tz: string,
  s: { printedName: string; meaning: string; reason: string; signedAt: string | Date },
): DocSignature => {
  const at = new Date(s.signedAt).toISOString();
  return {
    signer: s.printedName,
    meaning: s.meaning,
    reason: s.reason,
    signedAt: at,
    signedAtLocal: localTime(tz, at),
  };
};

const kindLabel = (kind: string) => PART_KIND_LABELS[kind as PartKind] ?? kind.replace(/_/g, ' ');

function treeOf(n: TrailNode): DocTreeNode {
  return {
    serial: n.serial,
    kind: n.kindLabel || kindLabel(n.kind),
    position: n.positionLabel,
    link: n.link === 'installed_in' ? 'fitted' : n.link === 'harvested_from' ? 'from core' : null,
    note: n.removedAt ? `taken out: ${n.removedReason ?? 'no reason given'}` : null,
    children: n.children.map(treeOf),
  };
}

function stagesOf(trail: TrailJson, kinds: Map<string, string>, tz: string): DocStage[] {
  return trail.results
    .filter((r) => r.supersededBy === null)
    .map((r) => ({
      serial: r.serial,
      part: kinds.get(r.serial) ?? '',
      stage: r.stage.name,
      station: r.station ?? '—',
      operator: r.operator,
      gauge: r.gauge ?? '—',
      finishedAtLocal: localTime(tz, r.finishedAt),
      verdict: r.verdict,
      note:
        [
          r.correctionReason
            ? `correction: ${r.correctionReason}`
            : r.reentryReason
              ? `re-entry: ${r.reentryReason}`
              : '',
          ...Object.entries(r.sizeClasses).map(
            ([code, k]) =>
              `size class ${r.readings.find((x) => x.characteristic === code)?.name ?? code}: ${k.name} (${k.code})`,
          ),
        ]
          .filter(Boolean)
          .join(' · ') || null,
      readings: r.readings.map((x): DocReading => ({
        characteristic: x.name,
        position: x.positionLabel,
        value: x.value === null ? (x.passed ? 'pass' : 'fail') : readingText(x.value, x.rule?.resolution ?? null),
        unit: x.unit ?? '',
        limits: limitsText(x.rule, x.lower, x.upper),
        verdict: x.verdict,
        rule: x.ruleVersion ? `v${x.ruleVersion}` : '—',
      })),
    }));
}

async function releaseSignature(serial: string, tz: string): Promise<DocSignature | null> {
  const s = await Signature.findOne({
    where: { entity: 'item', entityId: serial, meaning: RELEASE_MEANING },
    order: [['id', 'DESC']],
  });
  return s ? signatureOf(tz, s) : null;
}

export type IssueContext = { shipmentId: number; issuedAt: Date };

async function commonOf(trail: TrailJson, issue: IssueContext | null, prefix: string) {
  const plant = await plantSettings();
  const tz = plant.timeZone;
  const serial = trail.item.serial;
  const issuedAt = (issue?.issuedAt ?? new Date()).toISOString();
  const family = trail.item.family;
  const s = trail.shipment;
  const common: DocCommon = {
    documentNumber: issue ? `${prefix}-${serial}-${issue.shipmentId}` : `${prefix}-${serial}-DRAFT`,
    issuedAt,
    issuedAtLocal: localTime(tz, issuedAt),
    plant: { name: plant.name, address: plant.address, timeZone: tz },
    unit: { serial, familyCode: family.code, familyName: family.name },
    customer: s?.customer ?? null,
    shipment: s
      ? {
          reference: s.reference,
          carrier: s.carrier,
          shipDate: s.shipDate,
          warranty: `${s.warranty.months} months${s.warranty.km ? ` or ${s.warranty.km} km` : ''}, from ${s.warranty.startsOn} to ${s.warranty.endsOn}`,
        }
      : null,
    release: issue ? await releaseSignature(serial, tz) : null,
    links: {
      trail: appLink(`/trail?serial=${encodeURIComponent(serial)}`),
      verify: appLink('/verify'),
    },
  };
  return { common, tz };
}

async function unitTrail(sequelize: Sequelize, serial: string) {
  const trail = await trailOf(sequelize, serial);
  if (trail.item.kind !== 'long_block') {
    throw invalid(
      `${trail.item.serial} is not a long block: build records, certificates and slips are kept for units.`,
    );
  }
  return trail;
}

/** The build record's content: a draft (no issue) until the unit is released. */
export async function buildRecordContent(
  sequelize: Sequelize,
  serial: string,
  issue: IssueContext | null,
  known?: TrailJson,
): Promise<BuildRecordContent> {
  const trail = known ?? (await unitTrail(sequelize, serial));
  const { common, tz } = await commonOf(trail, issue, 'BR');
  const kinds = new Map<string, string>();
  const walk = (n: TrailNode) => {
    kinds.set(n.serial, `${n.kindLabel}${n.positionLabel ? ` ${n.positionLabel}` : ''}`);
    n.children.forEach(walk);
  };
  walk(trail.tree);
  return {
    layout: BUILD_RECORD_LAYOUT,
    ...common,
    genealogy: treeOf(trail.tree),
    lots: trail.lots.map((l) => ({
      kind: LOT_KIND_LABELS[l.kind as LotKind] ?? l.kind,
      supplier: l.supplier,
      partNumber: l.partNumber,
      lotCode: l.lotCode,
      quantity: l.quantity,
      // the size class the lot was matched to; else the pistons' oversize as entered
      note: l.sizeClass
        ? l.sizeClass
        : typeof l.attributes.oversizeIn === 'number'
          ? `+${l.attributes.oversizeIn.toFixed(3)} in`
          : '',
    })),
    stages: stagesOf(trail, kinds, tz),
    ncrs: trail.ncrs.map((n) => ({
      number: n.number,
      on: n.serial ?? `lot ${n.lotCode ?? ''}`,
      severity: n.severity,
      state: NCR_STATE_LABELS[n.state],
      description: n.description,
      disposition: n.disposition
        ? `${DISPOSITION_LABELS[n.disposition as Disposition]}${n.dispositionReason ? `: ${n.dispositionReason}` : ''}`
        : null,
      signatures: n.signatures.map((s) => signatureOf(tz, s)),
    })),
    caution: BUILD_RECORD_CAUTION,
  };
}

export async function certificateContent(
  sequelize: Sequelize,
  serial: string,
  issue: IssueContext,
  buildRecord: { documentNumber: string; contentHash: string },
  checks: { label: string; ok: boolean }[],
  known?: TrailJson,
): Promise<CertificateContent> {
  const trail = known ?? (await unitTrail(sequelize, serial));
  const { common } = await commonOf(trail, issue, 'COC');
  const unit = await findBySerial(serial);
  const family = await EngineFamily.findByPk(unit.engineFamilyId);
  const parts: { serial: string; kind: string }[] = [];
  const walk = (n: TrailNode) => {
    if (n.link === 'installed_in' && !n.removedAt) {
      parts.push({ serial: n.serial, kind: `${n.kindLabel}${n.positionLabel ? ` ${n.positionLabel}` : ''}` });
    }
    n.children.forEach(walk);
  };
  walk(trail.tree);
  return {
    layout: CERTIFICATE_LAYOUT,
    ...common,
    statement:
      `${common.plant.name} certifies that the remanufactured long block ${serial} (${family?.code ?? common.unit.familyCode}) ` +
      'was built and tested to the plant’s spec book versions recorded in its build record, that every required stage ' +
      'of the unit and of its parts has a current passing result, and that no nonconformance was open in its genealogy ' +
      'when it was released.',
    checks,
    buildRecord,
    parts,
  };
}

export async function packingSlipContent(
  sequelize: Sequelize,
  serial: string,
  issue: IssueContext,
  certificate: { documentNumber: string },
  known?: TrailJson,
): Promise<PackingSlipContent> {
  const trail = known ?? (await unitTrail(sequelize, serial));
  const { common } = await commonOf(trail, issue, 'PS');
  return {
    layout: PACKING_SLIP_LAYOUT,
    ...common,
    lines: [
      {
        quantity: 1,
        description: `Remanufactured long block, ${common.unit.familyCode} ${common.unit.familyName}`,
        serial,
      },
    ],
    notes: [
      `Certificate of conformance ${certificate.documentNumber} and the build record travel with this unit.`,
      'Check the unit against this slip on arrival; report damage or a missing item to the plant within 5 days.',
    ],
    certificate,
  };
}

export { unitTrail };
