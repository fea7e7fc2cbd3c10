import {
  BUILD_RECORD_LAYOUT,
  CERTIFICATE_LAYOUT,
  PACKING_SLIP_LAYOUT,
  type DocumentContent,
} from '../../../shared/documents/content.js';
import { drawBuildRecord } from './build-record.js';
import type { PaperSize } from './kit.js';
import type { DocumentReceipt } from './receipt.js';
import { drawCertificate, drawPackingSlip } from './release-papers.js';

/** Any issued document from its content: the layout named in the content chooses the drawing. */
export function drawDocument(content: DocumentContent, receipt: DocumentReceipt | null, size: PaperSize) {
  switch (content.layout) {
    case BUILD_RECORD_LAYOUT:
      return drawBuildRecord(content, receipt, size);
    case CERTIFICATE_LAYOUT:
      return drawCertificate(content, receipt, size);
    case PACKING_SLIP_LAYOUT:
      return drawPackingSlip(content, receipt, size);
  }
}

export const KNOWN_LAYOUTS: string[] = [BUILD_RECORD_LAYOUT, CERTIFICATE_LAYOUT, PACKING_SLIP_LAYOUT];
