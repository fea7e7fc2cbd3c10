import PDFDocument from 'pdfkit';

/** A real one-page PDF, as a supplier's certificate of conformance stands in for in tests. */
export function certificatePdf(text = 'Certificate of conformance'): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const doc = new PDFDocument({ size: 'A4' });
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    doc.text(text);
    doc.end();
  });
}
