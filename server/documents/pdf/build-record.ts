import type { BuildRecordContent, DocSignature, DocTreeNode } from '../../../shared/documents/content.js';
import { BAD, INK, RULE, SOFT, newSheet, type Column, type PaperSize, type Sheet } from './kit.js';
import { checkableFile, receiptBlock, titleBlock, type DocumentReceipt } from './receipt.js';

export const signedLine = (s: DocSignature) => `${s.signer} — “${s.meaning}” — ${s.reason} — ${s.signedAtLocal}`;

/** The plant's identity, then the unit, its customer and its shipment. */
export function identity(sheet: Sheet, c: BuildRecordContent | Omit<BuildRecordContent, 'layout'>) {
  sheet.fields([
    ['Plant', `${c.plant.name}${c.plant.address ? `\n${c.plant.address}` : ''}`],
    ['Unit', `${c.unit.serial}\n${c.unit.familyCode} · ${c.unit.familyName}`],
    ['Customer', c.customer ? `${c.customer.name} (${c.customer.code})` : 'not shipped'],
    [
      'Shipment',
      c.shipment
        ? `Order ${c.shipment.reference}, shipped ${c.shipment.shipDate}${c.shipment.carrier ? ` by ${c.shipment.carrier}` : ''}`
        : 'not shipped',
    ],
    ['Warranty', c.shipment?.warranty ?? '—'],
    ['Issued', `${c.issuedAtLocal} (${c.plant.timeZone})`],
  ]);
}

/** The genealogy as a small tree: the unit, what was fitted in it, and the core each part came from. */
function tree(sheet: Sheet, root: DocTreeNode) {
  const { doc, left } = sheet;
  const step = 18;
  const rowH = 13;
  const draw = (n: DocTreeNode, depth: number, parentY: number | null) => {
    sheet.ensure(rowH + 2);
    const y = doc.y;
    const x = left + depth * step;
    if (parentY !== null) {
      // an elbow from the parent's stem to this node
      doc
        .moveTo(x - step + 5, parentY + 9)
        .lineTo(x - step + 5, y + 5)
        .lineTo(x - 2, y + 5)
        .lineWidth(0.6)
        .strokeColor(RULE)
        .stroke();
    }
    sheet.font('monoBold', 8.5).text(n.serial, x, y, { continued: true, lineBreak: false });
    sheet
      .font('sans', 8.5, SOFT)
      .text(
        `   ${n.kind}${n.position ? ` (${n.position})` : ''}${n.link ? ` · ${n.link}` : ''}${n.note ? ` · ${n.note}` : ''}`,
        { lineBreak: false },
      );
    doc.y = y + rowH;
    // a page break inside a branch restarts the stem at the top of the new page
    let stemFrom = y;
    for (const child of n.children) {
      const before = doc.y;
      draw(child, depth + 1, stemFrom);
      if (doc.y < before) stemFrom = doc.page.margins.top - 6;
      else stemFrom = Math.max(stemFrom, before - rowH);
    }
  };
  draw(root, 0, null);
  doc.y += 4;
}

const READING_COLUMNS = (width: number): Column[] => {
  const fixedW = 112 + 50 + 30 + 92 + 36 + 26;
  return [
    { header: 'Characteristic', width: width - fixedW },
    { header: 'Position', width: 112 },
    { header: 'Value', width: 50, numeric: true },
    { header: 'Unit', width: 30 },
    { header: 'Limits', width: 92, numeric: true },
    { header: 'Verdict', width: 36 },
    { header: 'Rule', width: 26, numeric: true },
  ];
};

export async function drawBuildRecord(
  c: BuildRecordContent,
  receipt: DocumentReceipt | null,
  size: PaperSize,
): Promise<Buffer> {
  const draft = c.documentNumber.endsWith('-DRAFT');
  const sheet = newSheet(size, {
    title: `Build record ${c.unit.serial}`,
    author: c.plant.name,
    subject: `${c.documentNumber}${draft ? ' (draft)' : ''}`,
    at: new Date(c.issuedAt),
  });
  const { doc, left, width } = sheet;
  titleBlock(
    sheet,
    `Build record — ${c.unit.serial}`,
    [
      `${c.documentNumber}${draft ? ' · DRAFT, not released' : ''}`,
      `${c.unit.familyCode} ${c.unit.familyName} · remanufactured long block`,
    ],
    c.links.trail,
  );
  if (draft) {
    sheet.para('DRAFT — printed before release. Not a signed record; not for the customer.', {
      font: 'sansBold',
      color: BAD,
    });
  }
  identity(sheet, c);
  sheet.para(c.caution, { size: 7.5, color: SOFT });

  sheet.heading('Genealogy');
  tree(sheet, c.genealogy);

  sheet.heading('Purchased lots');
  if (!c.lots.length) sheet.para('None recorded.');
  else {
    const fixedW = 76 + 108 + 104 + 26 + 50;
    sheet.table(
      [
        { header: 'Part', width: 76 },
        { header: 'Supplier', width: width - fixedW },
        { header: 'Part number', width: 108, mono: true },
        { header: 'Lot', width: 104, mono: true },
        { header: 'Qty', width: 26, numeric: true },
        { header: 'Size', width: 50, numeric: true },
      ],
      c.lots.map((l) => ({ cells: [l.kind, l.supplier, l.partNumber, l.lotCode, String(l.quantity), l.note] })),
    );
  }

  sheet.heading('Stage results and readings');
  sheet.para(
    'Current results only; a corrected result is shown as corrected. Values are rounded to the resolution of the rule that judged them.',
    {
      size: 7.5,
      color: SOFT,
    },
  );
  const cols = READING_COLUMNS(width);
  for (const s of c.stages) {
    const caption = `${s.part} ${s.serial} · ${s.stage} — ${s.verdict === 'pass' ? 'pass' : 'FAIL'}`;
    const meta = `station ${s.station} · operator ${s.operator} · gauge ${s.gauge} · ${s.finishedAtLocal}${s.note ? ` · ${s.note}` : ''}`;
    if (!s.readings.length) {
      sheet.ensure(30);
      sheet.para(caption, { font: 'sansMedium', size: 9 });
      sheet.para(`${meta} · no readings`, { size: 7.5, color: SOFT });
      continue;
    }
    sheet.ensure(60);
    sheet.para(caption, { font: 'sansMedium', size: 9 });
    sheet.para(meta, { size: 7.5, color: SOFT });
    sheet.table(
      cols,
      s.readings.map((r) => ({
        cells: [
          r.characteristic,
          r.position,
          r.value,
          r.unit,
          r.limits,
          r.verdict === 'pass' ? 'pass' : 'FAIL',
          r.rule,
        ],
        bold: r.verdict === 'fail' ? [2, 5] : [],
        color: r.verdict === 'fail' ? [null, null, BAD, null, null, BAD, null] : [],
      })),
      { size: 7.8, continued: caption },
    );
  }

  sheet.heading('Nonconformances');
  if (!c.ncrs.length) sheet.para('None raised on this unit, its parts, their cores or its lots.');
  for (const n of c.ncrs) {
    sheet.ensure(50);
    sheet.para(`${n.number} · ${n.on} · ${n.severity} · ${n.state}`, { font: 'sansMedium', size: 9 });
    sheet.para(n.description, { size: 8.5 });
    sheet.para(`Disposition: ${n.disposition ?? 'not decided'}`, { size: 8.5 });
    for (const s of n.signatures) sheet.para(`Signed: ${signedLine(s)}`, { size: 8, color: INK });
    if (!n.signatures.length) sheet.para('No signatures.', { size: 8, color: SOFT });
    doc.y += 3;
  }

  sheet.heading('Release');
  if (c.release) {
    sheet.fields(
      [
        ['Signed by', c.release.signer],
        ['Meaning', c.release.meaning],
        ['Reason', c.release.reason],
        [
          'Time',
          `${c.release.signedAtLocal} (${c.plant.timeZone}) · ${c.release.signedAt.replace('T', ' ').slice(0, 19)} UTC`,
        ],
      ],
      1,
    );
  } else sheet.para('Not released.');

  receiptBlock(sheet, receipt, c.links.verify, draft);
  if (receipt) attach(doc, c.documentNumber, checkableFile(c, receipt), new Date(c.issuedAt));
  void left;
  return sheet.finish({
    left: `${c.plant.name} · Build record`,
    right: `${c.unit.serial} · ${c.documentNumber}`,
    footer: receipt
      ? `Issued ${c.issuedAtLocal} ${c.plant.timeZone} · content SHA-256 ${receipt.contentHash.slice(0, 16)}…`
      : draft
        ? 'Draft — not a signed record'
        : `Issued ${c.issuedAtLocal} ${c.plant.timeZone} · not yet covered by a signed log head`,
  });
}

/** The checkable data as a file attached to the PDF (any reader lists it; `npm run verify` reads it). */
export function attach(doc: PDFKit.PDFDocument, number: string, file: unknown, at: Date) {
  doc.file(Buffer.from(JSON.stringify(file), 'utf8'), {
    name: `${number}.json`,
    type: 'application/json',
    description: 'The data this document was printed from, with its place in the plant’s audit log',
    creationDate: at,
    modifiedDate: at,
    hidden: false,
  });
}
