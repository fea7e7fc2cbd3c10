import type { Sequelize } from 'sequelize';
import type {
  BuildRecordContent,
  CertificateContent,
  DocumentContent,
  PackingSlipContent,
} from '../../shared/documents/content.js';
import { contentHash } from '../../shared/ledger/entry.js';
import type { Ctx } from '../audit.js';
import { AppError, notFound } from '../errors.js';
import { receiptFor, recordDocument } from '../ledger/receipts.js';
import type { SequencerOptions } from '../ledger/sequencer.js';
import { AuditEvent, IssuedDocument, Shipment } from '../models/index.js';
import type { DocumentKind } from '../models/issued-document.js';
import { findBySerial } from '../services/items.js';
import { lockUnitsReachedBy } from '../services/unit-locks.js';
import { buildRecordContent, certificateContent, packingSlipContent, unitTrail } from './content.js';
import { drawDocument } from './pdf/draw.js';
import type { PaperSize } from './pdf/kit.js';
import type { DocumentReceipt } from './pdf/receipt.js';

export const DOCUMENT_TITLES: Record<DocumentKind, string> = {
  build_record: 'Build record',
  certificate: 'Certificate of conformance',
  packing_slip: 'Packing slip',
};

export type IssuedDocumentJson = {
  kind: DocumentKind;
  title: string;
  documentNumber: string;
  contentHash: string;
  issuedAt: string;
  auditEventId: number;
};

const present = (d: IssuedDocument): IssuedDocumentJson => ({
  kind: d.kind,
  title: DOCUMENT_TITLES[d.kind],
  documentNumber: d.documentNumber,
  contentHash: d.contentHash,
  issuedAt: d.createdAt.toISOString(),
  auditEventId: d.auditEventId,
});

async function currentShipment(unitId: number) {
  return Shipment.findOne({ where: { unitItemId: unitId }, order: [['id', 'DESC']] });
}

/** The documents issued for a unit's latest shipment (none before release). */
export async function listDocuments(serial: string) {
  const unit = await findBySerial(serial);
  const shipment = await currentShipment(unit.id);
  const docs = shipment
    ? await IssuedDocument.findAll({ where: { shipmentId: shipment.id }, order: [['id', 'ASC']] })
    : [];
  return { serial: unit.serial, released: !!shipment, documents: docs.map(present) };
}

/** The gate's checks as they stood when the unit was released (kept in the release's audit event). */
async function checksAtRelease(serial: string) {
  const ev = await AuditEvent.findOne({
    where: { action: 'unit.released', entity: 'item', entityId: serial },
    order: [['id', 'DESC']],
  });
  const after = (ev?.after ?? {}) as { checks?: { label: string; ok: boolean }[] };
  return (after.checks ?? []).map((c) => ({ label: c.label, ok: c.ok }));
}

/**
 * Issues the build record, certificate of conformance and packing slip of a released unit: their
 * content is read once from the same trail, each is logged (`document.issued` with its content
 * hash) and kept. Called right after a release commits; again, it returns what was issued.
 */
export async function issueReleaseDocuments(sequelize: Sequelize, ctx: Ctx, serial: string) {
  const unit = await findBySerial(serial);
  const shipment = await currentShipment(unit.id);
  if (!shipment)
    throw new AppError('not_released', `${unit.serial} has not been released: documents are issued at release.`);
  const have = await IssuedDocument.count({ where: { shipmentId: shipment.id } });
  if (have === 0) {
    const trail = await unitTrail(sequelize, unit.serial);
    const issue = { shipmentId: shipment.id, issuedAt: new Date() };
    const br = await buildRecordContent(sequelize, unit.serial, issue, trail);
    const coc = await certificateContent(
      sequelize,
      unit.serial,
      issue,
      { documentNumber: br.documentNumber, contentHash: contentHash(br) },
      await checksAtRelease(unit.serial),
      trail,
    );
    const ps = await packingSlipContent(sequelize, unit.serial, issue, { documentNumber: coc.documentNumber }, trail);
    await sequelize.transaction(async (transaction) => {
      // the unit's row first, as every path that can stop a unit takes it (the lock protocol,
      // services/unit-locks.ts): an NCR holding it may be opening a field action on this shipment,
      // so taking the shipment first deadlocks with it. Two requests issuing at once take turns;
      // the second finds the first's documents.
      await lockUnitsReachedBy(sequelize, { itemId: unit.id }, transaction);
      await Shipment.findByPk(shipment.id, { transaction, lock: transaction.LOCK.UPDATE });
      if (await IssuedDocument.count({ where: { shipmentId: shipment.id }, transaction })) return;
      const docs: [DocumentKind, DocumentContent][] = [
        ['build_record', br],
        ['certificate', coc],
        ['packing_slip', ps],
      ];
      for (const [kind, content] of docs) {
        const { eventId, contentHash: hash } = await recordDocument(ctx, transaction, {
          kind,
          entity: 'item',
          entityId: unit.serial,
          title: content.documentNumber,
          content,
        });
        await IssuedDocument.create(
          {
            kind,
            unitItemId: unit.id,
            shipmentId: shipment.id,
            documentNumber: content.documentNumber,
            content,
            contentHash: hash,
            auditEventId: eventId,
            issuedById: ctx.actor?.id ?? null,
          },
          { transaction },
        );
      }
    });
  }
  return listDocuments(unit.serial);
}

/**
 * A document as a PDF. An issued one is drawn from its stored content with its log receipt; a
 * build record asked for before release is drawn from the live trail as a draft, with no receipt.
 */
export async function documentPdf(
  sequelize: Sequelize,
  serial: string,
  kind: DocumentKind,
  paper: PaperSize,
  ledger: SequencerOptions,
): Promise<{ pdf: Buffer; fileName: string }> {
  const unit = await findBySerial(serial);
  const shipment = await currentShipment(unit.id);
  const issued = shipment ? await IssuedDocument.findOne({ where: { shipmentId: shipment.id, kind } }) : null;
  const size = paper === 'LETTER' ? 'letter' : 'a4';
  if (!issued) {
    if (kind !== 'build_record') {
      throw notFound(
        shipment
          ? `The ${DOCUMENT_TITLES[kind].toLowerCase()} of ${unit.serial}`
          : `A ${DOCUMENT_TITLES[kind].toLowerCase()} for ${unit.serial} (it is issued at release)`,
      );
    }
    const draft = await buildRecordContent(sequelize, unit.serial, null);
    return { pdf: await drawDocument(draft, null, paper), fileName: `build-record-${unit.serial}-draft-${size}.pdf` };
  }
  const content = issued.content as BuildRecordContent | CertificateContent | PackingSlipContent;
  const fileName = `${issued.documentNumber}-${size}.pdf`;
  let r;
  try {
    r = await receiptFor(sequelize, issued.auditEventId, ledger);
  } catch (err) {
    // no signed head covers it (a server without a signing key): the issued document, not checkable yet
    if (err instanceof AppError && err.code === 'not_yet_in_log') {
      return { pdf: await drawDocument(content, null, paper), fileName };
    }
    throw err;
  }
  const receipt: DocumentReceipt = {
    format: 'coretrail-document/1',
    entry: r.entry,
    leafIndex: r.leafIndex,
    treeSize: r.treeSize,
    rootHash: r.rootHash,
    proof: r.proof,
    head: r.head,
    code: r.code,
    contentHash: issued.contentHash,
  };
  return { pdf: await drawDocument(content, receipt, paper), fileName };
}

/**
 * Right after a release commits. The release stands whatever happens here: if issuing fails (the
 * database went away between the two), the shipping screen offers to issue the documents again.
 */
export async function issueAfterRelease(sequelize: Sequelize, ctx: Ctx, serial: string) {
  try {
    return (await issueReleaseDocuments(sequelize, ctx, serial)).documents;
  } catch (err) {
    console.error(`[${ctx.requestId}] release of ${serial}: its documents were not issued:`, err);
    return null;
  }
}
