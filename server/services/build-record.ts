import PDFDocument from 'pdfkit';
import type { Sequelize } from 'sequelize';
import { LOT_KIND_LABELS, type LotKind, type TrailJson, type TrailNode } from '../../shared/schemas/build.js';
import { DISPOSITION_LABELS, NCR_STATE_LABELS, type Disposition } from '../../shared/schemas/ncr.js';
import { invalid } from '../errors.js';
import { trailOf } from './trail.js';

// The PDF's own standard faces, which every reader has: nothing is embedded or fetched. They cover
// WinAnsi only, so the few signs outside it are written out.
const FONT = { regular: 'Helvetica', bold: 'Helvetica-Bold', mono: 'Courier' };
const winAnsi = (text: string) =>
  text.replace(/≥/g, '>=').replace(/≤/g, '<=').replace(/−/g, '-').replace(/→/g, '->').replace(/≠/g, '!=');

export const BUILD_RECORD_CAUTION =
  'Limits shown are those of the plant spec book version each reading was judged against. Specification values come from the plant’s own engineering documents; this record does not replace them.';

const fmt = (v: number | null, unit: string | null) => (v === null ? '—' : `${v}${unit ? ` ${unit}` : ''}`);

/** Per stage and characteristic of the current results: range of values, limits, verdicts, rule version. */
function keyMeasurements(trail: TrailJson) {
  const current = trail.results.filter((r) => r.supersededBy === null);
  const rows: {
    serial: string;
    stage: string;
    name: string;
    values: string;
    limits: string;
    verdict: string;
    version: string;
  }[] = [];
  for (const r of current) {
    const byChar = new Map<string, typeof r.readings>();
    for (const x of r.readings) byChar.set(x.characteristic, [...(byChar.get(x.characteristic) ?? []), x]);
    for (const xs of byChar.values()) {
      const first = xs[0]!;
      const nums = xs.map((x) => x.value).filter((v): v is number => v !== null);
      const lo = Math.min(...nums);
      const hi = Math.max(...nums);
      const values = nums.length
        ? nums.length === 1
          ? fmt(nums[0]!, first.unit)
          : lo === hi
            ? `${lo} ${first.unit ?? ''} (all ${nums.length})`
            : `${lo} to ${hi} ${first.unit ?? ''} (${nums.length})`
        : xs.every((x) => x.passed)
          ? 'Pass'
          : 'Fail';
      const limits =
        first.lower !== null && first.upper !== null
          ? `${first.lower} to ${first.upper} ${first.unit ?? ''}`
          : first.lower !== null
            ? `≥ ${first.lower} ${first.unit ?? ''}`
            : first.upper !== null
              ? `≤ ${first.upper} ${first.unit ?? ''}`
              : 'pass/fail';
      const fails = xs.filter((x) => x.verdict === 'fail').length;
      rows.push({
        serial: r.serial,
        stage: r.stage.name,
        name: first.name,
        values,
        limits,
        verdict: fails ? `FAIL (${fails})` : 'pass',
        version: first.ruleVersion ? `v${first.ruleVersion}` : '—',
      });
    }
  }
  return rows;
}

/** The unit's build record as a PDF: identification, genealogy, key measurements, NCRs, release. */
export async function buildRecordPdf(sequelize: Sequelize, serial: string): Promise<Buffer> {
  const trail = await trailOf(sequelize, serial);
  if (trail.item.kind !== 'long_block') {
    throw invalid(`${trail.item.serial} is not a long block: a build record is kept for units.`);
  }
  const doc = new PDFDocument({
    size: 'A4',
    margin: 48,
    info: { Title: `Build record ${trail.item.serial}`, Author: 'Coretrail' },
  });
  doc.registerFont('regular', FONT.regular);
  doc.registerFont('bold', FONT.bold);
  doc.registerFont('mono', FONT.mono);
  // every string goes through one place, so none can carry a sign the standard faces lack
  const text = doc.text.bind(doc);
  doc.text = ((t: string, ...rest: unknown[]) => text(winAnsi(String(t)), ...(rest as []))) as typeof doc.text;
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve) => doc.on('end', () => resolve(Buffer.concat(chunks))));

  const h = (text: string) =>
    doc.moveDown(0.8).font('bold').fontSize(13).fillColor('#0f5362').text(text).fillColor('#1b1b1b').moveDown(0.3);
  const p = (text: string, size = 10) => doc.font('regular').fontSize(size).text(text);

  doc.font('bold').fontSize(20).text(`Build record — ${trail.item.serial}`);
  p(
    `${trail.item.family.code} · ${trail.item.family.name} · long block · status ${trail.item.status.replace(/_/g, ' ')}`,
    11,
  );
  p(`Printed ${new Date().toISOString().slice(0, 16).replace('T', ' ')} UTC by Coretrail`, 9);
  doc.moveDown(0.4);
  doc.font('regular').fontSize(9).fillColor('#6b4a00').text(BUILD_RECORD_CAUTION).fillColor('#1b1b1b');

  h('Genealogy');
  const line = (n: TrailNode, depth: number) => {
    const how = n.link === 'installed_in' ? 'installed' : n.link === 'harvested_from' ? 'from core' : '';
    doc
      .font('mono')
      .fontSize(10)
      .text(
        `${'    '.repeat(depth)}${n.serial}  ${n.kindLabel}${n.positionLabel ? ` (${n.positionLabel})` : ''}${how ? ` — ${how}` : ''}`,
      );
    n.children.forEach((c) => line(c, depth + 1));
  };
  line(trail.tree, 0);

  h('Purchased lots');
  if (!trail.lots.length) p('None recorded.');
  for (const l of trail.lots) {
    const over =
      typeof l.attributes.oversizeIn === 'number' ? `, +${(l.attributes.oversizeIn as number).toFixed(3)} in` : '';
    p(
      `${LOT_KIND_LABELS[l.kind as LotKind] ?? l.kind}: ${l.supplier}, part ${l.partNumber}, lot ${l.lotCode} × ${l.quantity}${over}`,
    );
  }

  h('Key measurements (current results)');
  for (const r of keyMeasurements(trail)) {
    doc
      .font('regular')
      .fontSize(8.5)
      .text(`${r.serial} · ${r.stage} · ${r.name}: ${r.values}; limits ${r.limits}; ${r.verdict}; rule ${r.version}`);
  }

  h('Nonconformances');
  if (!trail.ncrs.length) p('None.');
  for (const n of trail.ncrs) {
    p(
      `${n.number} (${n.severity}, ${NCR_STATE_LABELS[n.state]}) on ${n.serial ?? n.lotCode}: ${n.description}${
        n.disposition
          ? ` — disposition: ${DISPOSITION_LABELS[n.disposition as Disposition]}${n.dispositionReason ? ` (${n.dispositionReason})` : ''}`
          : ''
      }`,
      9,
    );
    for (const s of n.signatures)
      p(`    signed by ${s.printedName}, ${s.signedAt.slice(0, 16).replace('T', ' ')} UTC: ${s.meaning}`, 8.5);
  }

  h('Release');
  if (trail.shipment) {
    const s = trail.shipment;
    p(
      `Shipped ${s.shipDate} to ${s.customer?.name ?? '—'} (${s.customer?.code ?? ''}), order ${s.reference}${s.carrier ? `, by ${s.carrier}` : ''}.`,
    );
    p(
      `Released by ${s.releasedBy}. Warranty ${s.warranty.months} months${s.warranty.km ? ` or ${String(s.warranty.km).replace(/\B(?=(\d{3})+(?!\d))/g, ' ')} km` : ''}, to ${s.warranty.endsOn}.`,
    );
  } else {
    p('Not released yet.');
  }
  doc.end();
  return done;
}
