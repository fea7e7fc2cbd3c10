import { createRequire } from 'node:module';
import PDFDocument from 'pdfkit';
import QRCode from 'qrcode';

/**
 * The few things every Coretrail document is drawn with: IBM Plex (shipped in the npm packages
 * @expo-google-fonts/ibm-plex-sans and -mono, whose TTFs carry ≤ ≥ ± and the minus sign that the
 * browser subsets lack), a running header and "Page n of m" on every page, tables whose figures
 * sit right-aligned in the monospaced face, and QR codes drawn as vectors. Everything drawn comes
 * from the content and the receipt, and the file's dates are the issue time, so the same inputs
 * give the same bytes: `npm run verify` draws a document again and compares.
 */
const require = createRequire(import.meta.url);
const FONT_FILES = {
  sans: '@expo-google-fonts/ibm-plex-sans/400Regular/IBMPlexSans_400Regular.ttf',
  sansMedium: '@expo-google-fonts/ibm-plex-sans/500Medium/IBMPlexSans_500Medium.ttf',
  sansBold: '@expo-google-fonts/ibm-plex-sans/600SemiBold/IBMPlexSans_600SemiBold.ttf',
  mono: '@expo-google-fonts/ibm-plex-mono/400Regular/IBMPlexMono_400Regular.ttf',
  monoBold: '@expo-google-fonts/ibm-plex-mono/600SemiBold/IBMPlexMono_600SemiBold.ttf',
} as const;
export type FontName = keyof typeof FONT_FILES;
const fontPaths = Object.fromEntries(Object.entries(FONT_FILES).map(([k, v]) => [k, require.resolve(v)])) as Record<
  FontName,
  string
>;

export type PaperSize = 'A4' | 'LETTER';
export const PAPER_SIZES: PaperSize[] = ['A4', 'LETTER'];

export const INK = '#1b1b1b';
export const SOFT = '#55595c';
export const RULE = '#9aa0a3';
export const ACCENT = '#0f5362';
export const BAD = '#9b1c1c';

const MARGIN = { top: 78, bottom: 58, left: 50, right: 50 };

export type Sheet = {
  doc: PDFKit.PDFDocument;
  left: number;
  right: number;
  width: number;
  bottom: number;
  /** Room left on this page below the cursor. */
  room(): number;
  /** A new page when less than `h` points remain. */
  ensure(h: number): void;
  font(name: FontName, size: number, color?: string): PDFKit.PDFDocument;
  heading(text: string): void;
  para(text: string, opts?: { size?: number; color?: string; font?: FontName }): void;
  /** Label–value pairs in two columns. */
  fields(pairs: [string, string][], columns?: number): void;
  table(columns: Column[], rows: Row[], opts?: { size?: number; caption?: string; continued?: string }): void;
  qr(text: string, x: number, y: number, size: number): void;
  finish(header: HeaderInfo): Promise<Buffer>;
};

/** `mono` for one-word codes (serials, lots); `numeric` for figures, in Plex Sans' tabular figures. */
export type Column = { header: string; width: number; align?: 'left' | 'right'; mono?: boolean; numeric?: boolean };
export type Row = { cells: string[]; bold?: number[]; color?: (string | null)[] };
export type HeaderInfo = { left: string; right: string; footer: string };

export function newSheet(size: PaperSize, meta: { title: string; author: string; subject: string; at: Date }): Sheet {
  const doc = new PDFDocument({
    size,
    margins: MARGIN,
    bufferPages: true,
    info: {
      Title: meta.title,
      Author: meta.author,
      Subject: meta.subject,
      Creator: 'Coretrail',
      CreationDate: meta.at,
    },
    lang: 'en',
  });
  for (const [name, file] of Object.entries(fontPaths)) doc.registerFont(name, file);
  // fontkit 2.0.4 cannot measure IBM Plex Mono's space glyph (U+0020 and U+00A0 share it): in the
  // monospaced face a figure space (U+2007), the same width there, stands in for it
  let mono = false;
  const rawText = doc.text.bind(doc);
  doc.text = ((t: string, ...rest: unknown[]) =>
    rawText(mono && typeof t === 'string' ? t.replace(/[ \u00a0]/g, '\u2007') : t, ...(rest as []))) as typeof doc.text;
  const fix = (t: string) => (mono ? t.replace(/[ \u00a0]/g, '\u2007') : t);
  const rawHeight = doc.heightOfString.bind(doc);
  doc.heightOfString = ((t: string, o?: PDFKit.Mixins.TextOptions) =>
    rawHeight(fix(t), o)) as typeof doc.heightOfString;
  const rawWidth = doc.widthOfString.bind(doc);
  doc.widthOfString = ((t: string, o?: PDFKit.Mixins.TextOptions) => rawWidth(fix(t), o)) as typeof doc.widthOfString;
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve) => doc.on('end', () => resolve(Buffer.concat(chunks))));
  const left = MARGIN.left;
  const width = doc.page.width - MARGIN.left - MARGIN.right;
  const right = left + width;
  const bottom = doc.page.height - MARGIN.bottom;

  const sheet: Sheet = {
    doc,
    left,
    right,
    width,
    bottom,
    room: () => bottom - doc.y,
    ensure(h) {
      if (doc.y + h > bottom) doc.addPage();
    },
    font(name, size, color = INK) {
      mono = name.startsWith('mono');
      return doc.font(name).fontSize(size).fillColor(color);
    },
    heading(text) {
      sheet.ensure(60);
      doc.y += 10;
      sheet.font('sansBold', 11.5, ACCENT).text(text, left, doc.y, { width });
      const y = doc.y + 2;
      doc.moveTo(left, y).lineTo(right, y).lineWidth(0.6).strokeColor(ACCENT).stroke();
      doc.y = y + 6;
    },
    para(text, opts = {}) {
      sheet.font(opts.font ?? 'sans', opts.size ?? 9.5, opts.color ?? INK);
      sheet.ensure(doc.heightOfString(text, { width }) + 2);
      doc.text(text, left, doc.y, { width });
      doc.y += 2;
    },
    fields(pairs, columns = 2) {
      const gap = 14;
      const colW = (width - gap * (columns - 1)) / columns;
      const labelW = 78;
      for (let i = 0; i < pairs.length; i += columns) {
        const row = pairs.slice(i, i + columns);
        sheet.font('sans', 9);
        const h = Math.max(...row.map(([, v]) => doc.heightOfString(v || '—', { width: colW - labelW })));
        sheet.ensure(h + 4);
        const y = doc.y;
        row.forEach(([label, value], c) => {
          const x = left + c * (colW + gap);
          sheet.font('sans', 8, SOFT).text(label, x, y + 1, { width: labelW - 4, lineBreak: false });
          sheet.font('sans', 9, INK).text(value || '—', x + labelW, y, { width: colW - labelW });
        });
        doc.y = y + h + 4;
      }
    },
    table(columns, rows, opts = {}) {
      const size = opts.size ?? 8.5;
      const pad = 3;
      const drawHeader = () => {
        const y = doc.y;
        let x = left;
        sheet.font('sansMedium', size - 0.5, SOFT);
        for (const c of columns) {
          doc.text(c.header, x + pad, y, {
            width: c.width - 2 * pad,
            align: c.align ?? (c.numeric ? 'right' : 'left'),
            lineBreak: false,
          });
          x += c.width;
        }
        const ly = y + size + 4;
        doc
          .moveTo(left, ly)
          .lineTo(left + total, ly)
          .lineWidth(0.6)
          .strokeColor(INK)
          .stroke();
        doc.y = ly + 3;
      };
      const total = columns.reduce((s, c) => s + c.width, 0);
      const heightOf = (r: Row) =>
        Math.max(
          ...columns.map((c, i) => {
            sheet.font(c.mono ? 'mono' : 'sans', c.mono ? size - 0.5 : size);
            return doc.heightOfString(r.cells[i] || 'x', { width: c.width - 2 * pad });
          }),
        );
      if (opts.caption) {
        sheet.ensure(size * 2 + 2 * (heightOf(rows[0] ?? { cells: [] }) + 4) + 14);
        sheet.font('sansMedium', 9, INK).text(opts.caption, left, doc.y, { width });
        doc.y += 2;
      } else sheet.ensure(size * 2 + heightOf(rows[0] ?? { cells: [] }) + 8);
      drawHeader();
      rows.forEach((r, ri) => {
        const h = heightOf(r);
        if (doc.y + h + 3 > bottom) {
          doc.addPage();
          const label = opts.continued ?? opts.caption;
          if (label) {
            sheet.font('sans', 8, SOFT).text(`${label} (continued)`, left, doc.y, { width });
            doc.y += 2;
          }
          drawHeader();
        }
        const y = doc.y;
        let x = left;
        columns.forEach((c, i) => {
          const bold = r.bold?.includes(i);
          const font: FontName = c.mono ? (bold ? 'monoBold' : 'mono') : bold ? 'sansBold' : 'sans';
          sheet.font(font, c.mono ? size - 0.5 : size, r.color?.[i] ?? INK);
          doc.text(r.cells[i] ?? '', x + pad, y, {
            width: c.width - 2 * pad,
            align: c.align ?? (c.numeric ? 'right' : 'left'),
            features: c.numeric ? ['tnum'] : [],
          });
          x += c.width;
        });
        const ly = y + h + 1.5;
        if (ri < rows.length - 1) {
          doc
            .moveTo(left, ly)
            .lineTo(left + total, ly)
            .lineWidth(0.25)
            .strokeColor(RULE)
            .stroke();
        }
        doc.y = ly + 2;
      });
      doc
        .moveTo(left, doc.y - 1)
        .lineTo(left + total, doc.y - 1)
        .lineWidth(0.6)
        .strokeColor(INK)
        .stroke();
      doc.y += 6;
    },
    qr(text, x, y, size) {
      const code = QRCode.create(text, { errorCorrectionLevel: 'M' });
      const n = code.modules.size;
      const cell = size / n;
      doc.save().fillColor('#000000');
      for (let r = 0; r < n; r++) {
        for (let c = 0; c < n; c++) if (code.modules.get(r, c)) doc.rect(x + c * cell, y + r * cell, cell, cell);
      }
      doc.fill().restore();
    },
    async finish(header) {
      const range = doc.bufferedPageRange();
      for (let i = range.start; i < range.start + range.count; i++) {
        doc.switchToPage(i);
        // the header and footer sit in the margins: no automatic page break may fire while drawing them
        const keep = doc.page.margins.bottom;
        doc.page.margins.bottom = 0;
        const hy = 34;
        sheet.font('sansBold', 9, INK).text(header.left, left, hy, { width: width * 0.62, lineBreak: false });
        sheet.font('sans', 9, INK).text(header.right, left + width * 0.62, hy, {
          width: width * 0.38,
          align: 'right',
          lineBreak: false,
        });
        doc
          .moveTo(left, hy + 14)
          .lineTo(right, hy + 14)
          .lineWidth(0.8)
          .strokeColor(INK)
          .stroke();
        const fy = doc.page.height - 40;
        doc
          .moveTo(left, fy - 5)
          .lineTo(right, fy - 5)
          .lineWidth(0.4)
          .strokeColor(RULE)
          .stroke();
        sheet.font('sans', 7.5, SOFT).text(header.footer, left, fy, { width: width * 0.75, lineBreak: false });
        sheet.font('sans', 8, INK).text(`Page ${i - range.start + 1} of ${range.count}`, left + width * 0.75, fy, {
          width: width * 0.25,
          align: 'right',
          lineBreak: false,
        });
        doc.page.margins.bottom = keep;
      }
      doc.end();
      return done;
    },
  };
  return sheet;
}
