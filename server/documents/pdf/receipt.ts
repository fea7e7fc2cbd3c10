import type { CheckableDocument } from '../../../shared/ledger/document.js';
import { ACCENT, SOFT, type Sheet } from './kit.js';

/** What a document carries to be checked: everything in the checkable file but its content. */
export type DocumentReceipt = Omit<CheckableDocument, 'content'> & { contentHash: string };

/** The file embedded in the PDF: content and receipt together, as `npm run verify` and /verify read it. */
export function checkableFile(content: unknown, r: DocumentReceipt): CheckableDocument {
  const { contentHash: _h, ...rest } = r;
  return { ...rest, content };
}

/** The first page's identity block: the document's title, its number and a QR code that opens the trail. */
export function titleBlock(sheet: Sheet, title: string, lines: string[], trailUrl: string) {
  const { doc, left, width } = sheet;
  const top = doc.y;
  const qr = 62;
  sheet.font('sansBold', 19, ACCENT).text(title, left, top, { width: width - qr - 12 });
  for (const l of lines) sheet.font('sans', 9.5).text(l, left, doc.y, { width: width - qr - 12 });
  const textBottom = doc.y;
  sheet.qr(trailUrl, left + width - qr, top, qr);
  sheet.font('sans', 6.5, SOFT).text('Scan to open the trail', left + width - qr - 10, top + qr + 2, {
    width: qr + 10,
    align: 'center',
  });
  doc.y = Math.max(textBottom, top + qr + 12) + 4;
}

/** The closing block: how to check this document, with the code as text and as a QR code. */
export function receiptBlock(sheet: Sheet, r: DocumentReceipt | null, verifyUrl: string, draft: boolean) {
  const { doc, left, width } = sheet;
  // the heading stays with its block: the QR code and the lines beside it
  if (r) sheet.ensure(170);
  sheet.heading('Checking this document');
  if (!r) {
    sheet.para(
      draft
        ? 'This is a draft printed before release. It is not in the plant’s log and cannot be checked: ask for the issued record.'
        : 'This document is logged, but no signed head of the plant’s log covers it yet (the server signs none without its key), so this copy cannot be checked. Print it again once the plant signs its log.',
      { color: SOFT },
    );
    return;
  }
  const qr = 118;
  sheet.font('mono', 6.2);
  const codeH = doc.heightOfString(r.code ?? '', { width: width - qr - 14, characterSpacing: 0 });
  sheet.ensure(Math.max(qr + 20, codeH + 90));
  const top = doc.y;
  sheet.qr(r.code ?? '', left, top, qr);
  sheet.font('sans', 6.5, SOFT).text('Log code (QR)', left, top + qr + 2, { width: qr, align: 'center' });
  const x = left + qr + 14;
  const w = width - qr - 14;
  const line = (label: string, value: string, face: 'mono' | 'sans' = 'mono') => {
    sheet.font('sans', 7.5, SOFT).text(`${label}  `, x, doc.y, { width: w, continued: true });
    sheet.font(face, 7.2).text(value, { width: w });
  };
  doc.y = top;
  sheet
    .font('sans', 8.5)
    .text(
      `Check this document at ${verifyUrl} or with npm run verify -- FILE.pdf. The data it was printed from is attached to this PDF; its hash is in the plant’s audit log under a head signed with the plant’s key.`,
      x,
      doc.y,
      { width: w },
    );
  doc.y += 3;
  line('Content SHA-256', r.contentHash);
  line('Log entry', `${r.leafIndex + 1} of ${r.treeSize}`, 'sans');
  line('Log root', r.rootHash);
  line('Head signed', `${new Date(r.head.timestamp).toISOString().replace('T', ' ').slice(0, 19)} UTC`, 'sans');
  line('Plant key', r.head.keyId);
  sheet.font('sans', 7.5, SOFT).text('Code', x, doc.y + 2, { width: w });
  sheet.font('mono', 6.2).text(r.code ?? '', x, doc.y, { width: w });
  doc.y = Math.max(doc.y, top + qr + 12);
}
