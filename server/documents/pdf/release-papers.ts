import type { CertificateContent, PackingSlipContent } from '../../../shared/documents/content.js';
import { attach } from './build-record.js';
import { ACCENT, BAD, SOFT, newSheet, type PaperSize, type Sheet } from './kit.js';
import { checkableFile, receiptBlock, titleBlock, type DocumentReceipt } from './receipt.js';

/** The release signature as a signature block: printed name, meaning, reason and time. */
function signatureBlock(sheet: Sheet, c: CertificateContent | PackingSlipContent) {
  sheet.heading('Release signature');
  if (!c.release) {
    sheet.para('No release signature was found for this unit.', { color: BAD });
    return;
  }
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
  sheet.para('Signed electronically in Coretrail: the signer re-entered their password at the moment of release.', {
    size: 7.5,
    color: SOFT,
  });
}

function parties(sheet: Sheet, c: CertificateContent | PackingSlipContent, from: string, to: string) {
  sheet.fields([
    [from, `${c.plant.name}${c.plant.address ? `\n${c.plant.address}` : ''}`],
    [to, c.customer ? `${c.customer.name}\nCustomer ${c.customer.code}` : '—'],
    ['Order', c.shipment?.reference ?? '—'],
    ['Ship date', c.shipment?.shipDate ?? '—'],
    ['Carrier', c.shipment?.carrier ?? '—'],
    ['Issued', `${c.issuedAtLocal} (${c.plant.timeZone})`],
  ]);
}

export async function drawCertificate(c: CertificateContent, receipt: DocumentReceipt | null, size: PaperSize) {
  const sheet = newSheet(size, {
    title: `Certificate of conformance ${c.unit.serial}`,
    author: c.plant.name,
    subject: c.documentNumber,
    at: new Date(c.issuedAt),
  });
  const { width } = sheet;
  titleBlock(
    sheet,
    'Certificate of conformance',
    [c.documentNumber, `Unit ${c.unit.serial} · ${c.unit.familyCode} ${c.unit.familyName}`],
    c.links.trail,
  );
  parties(sheet, c, 'Manufacturer', 'Customer');
  sheet.heading('Statement');
  sheet.para(c.statement, { size: 10 });
  sheet.para(`Warranty: ${c.shipment?.warranty ?? '—'}.`, { size: 9 });
  sheet.para(
    `The measurements behind this statement are in build record ${c.buildRecord.documentNumber} (content SHA-256 ${c.buildRecord.contentHash}).`,
    { size: 8.5, color: SOFT },
  );
  sheet.heading('Release checks');
  sheet.table(
    [
      { header: 'Check', width: width - 60 },
      { header: 'Result', width: 60 },
    ],
    c.checks.map((k) => ({ cells: [k.label, k.ok ? 'met' : 'NOT MET'], bold: k.ok ? [] : [1] })),
  );
  sheet.heading('Major parts in the unit');
  sheet.table(
    [
      { header: 'Part', width: width - 150 },
      { header: 'Serial', width: 150, mono: true },
    ],
    c.parts.map((p) => ({ cells: [p.kind, p.serial] })),
  );
  signatureBlock(sheet, c);
  receiptBlock(sheet, receipt, c.links.verify, false);
  if (receipt) attach(sheet.doc, c.documentNumber, checkableFile(c, receipt), new Date(c.issuedAt));
  return sheet.finish({
    left: `${c.plant.name} · Certificate of conformance`,
    right: `${c.unit.serial} · ${c.documentNumber}`,
    footer: receipt ? `Content SHA-256 ${receipt.contentHash.slice(0, 16)}…` : 'Not issued',
  });
}

export async function drawPackingSlip(c: PackingSlipContent, receipt: DocumentReceipt | null, size: PaperSize) {
  const sheet = newSheet(size, {
    title: `Packing slip ${c.unit.serial}`,
    author: c.plant.name,
    subject: c.documentNumber,
    at: new Date(c.issuedAt),
  });
  const { width } = sheet;
  titleBlock(sheet, 'Packing slip', [c.documentNumber, `Order ${c.shipment?.reference ?? '—'}`], c.links.trail);
  parties(sheet, c, 'Ship from', 'Ship to');
  sheet.heading('Contents');
  sheet.table(
    [
      { header: 'Qty', width: 36, numeric: true },
      { header: 'Description', width: width - 36 - 150 },
      { header: 'Serial', width: 150, mono: true },
    ],
    c.lines.map((l) => ({ cells: [String(l.quantity), l.description, l.serial] })),
    { size: 9.5 },
  );
  for (const n of c.notes) sheet.para(n, { size: 8.5 });
  signatureBlock(sheet, c);
  sheet.heading('Received by');
  sheet.para('Name, signature and date on receipt:', { size: 8.5, color: SOFT });
  const { doc, left } = sheet;
  doc.y += 22;
  doc
    .moveTo(left, doc.y)
    .lineTo(left + width * 0.6, doc.y)
    .lineWidth(0.5)
    .strokeColor(ACCENT)
    .stroke();
  doc.y += 8;
  receiptBlock(sheet, receipt, c.links.verify, false);
  if (receipt) attach(sheet.doc, c.documentNumber, checkableFile(c, receipt), new Date(c.issuedAt));
  return sheet.finish({
    left: `${c.plant.name} · Packing slip`,
    right: `${c.unit.serial} · ${c.documentNumber}`,
    footer: receipt ? `Content SHA-256 ${receipt.contentHash.slice(0, 16)}…` : 'Not issued',
  });
}
