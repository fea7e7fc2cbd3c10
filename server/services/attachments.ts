import { createHash, randomUUID } from 'node:crypto';
import { fileTypeFromBuffer } from 'file-type';
import { Op, type Sequelize, type Transaction } from 'sequelize';
import type { AttachmentJson } from '../../shared/schemas/attachments.js';
import { recordAudit, type Ctx } from '../audit.js';
import { AppError, invalid, notFound } from '../errors.js';
import { Attachment } from '../models/index.js';
import type { BlobStore } from '../storage/blob-store.js';

/** A calibration certificate: a PDF, recognised by its bytes. */
export const CERTIFICATE_TYPES: Record<string, string> = { 'application/pdf': 'pdf' };

/** Photos, recognised by their bytes: the name and the browser's Content-Type are not trusted. */
export const IMAGE_TYPES: Record<string, string> = { 'image/jpeg': 'jpg', 'image/png': 'png', 'image/webp': 'webp' };
/** Documents a record may also claim where it says so (a corrective action's evidence): PDF. */
export const DOCUMENT_TYPES: Record<string, string> = { 'application/pdf': 'pdf' };
export const MAX_UPLOAD_BYTES = 8 * 1024 * 1024;

export const presentAttachment = (a: Attachment): AttachmentJson => ({
  id: a.id,
  fileName: a.fileName,
  mimeType: a.mimeType,
  sizeBytes: a.sizeBytes,
  url: `/api/attachments/${a.id}`,
  createdAt: a.createdAt.toISOString(),
});

/**
 * The name kept for a photo: letters, digits, dots, dashes and spaces of what was sent, and always
 * the extension of the type its bytes showed (a JPEG sent as poly.html is kept as poly.jpg).
 */
export function storedName(sent: string, ext: string): string {
  const base = sent
    .normalize('NFKC')
    .replace(/[^\p{L}\p{N}._ -]/gu, '_')
    .replace(/\.[^.]*$/, '')
    .replace(/^[.\s]+|[.\s]+$/g, '')
    .slice(-100);
  return `${base || 'photo'}.${ext}`;
}

/** Photos a person uploaded in the last 24 hours, claimed or not, for the daily quota. */
export const uploadsToday = (userId: number) =>
  Attachment.count({ where: { uploadedById: userId, createdAt: { [Op.gt]: new Date(Date.now() - 24 * 3600_000) } } });

/**
 * Stores an uploaded photo, not yet attached to anything ("pending", owned by the uploader) until a
 * record claims it. The file is written first and removed again if the row cannot be.
 */
export async function storeUpload(
  sequelize: Sequelize,
  store: BlobStore,
  ctx: Ctx,
  file: { buffer: Buffer; originalname: string; size: number },
  accept: { types: Record<string, string>; code: 'not_an_image' | 'not_a_pdf'; message: string } = {
    // a PDF is taken only where a record says so (a corrective action's evidence)
    types: { ...IMAGE_TYPES, ...DOCUMENT_TYPES },
    code: 'not_an_image',
    message: 'Only photos (JPEG, PNG or WebP) or PDF documents can be attached. This file is none of them.',
  },
): Promise<AttachmentJson> {
  const detected = await fileTypeFromBuffer(file.buffer);
  const ext = detected && accept.types[detected.mime];
  if (!detected || !ext) throw new AppError(accept.code, accept.message);
  const key = `${randomUUID()}.${ext}`;
  await store.put(key, file.buffer);
  try {
    return await sequelize.transaction(async (transaction) => {
      const a = await Attachment.create(
        {
          entity: 'pending',
          entityId: String(ctx.actor!.id),
          fileName: storedName(file.originalname, ext),
          mimeType: detected.mime,
          sizeBytes: file.size,
          sha256: createHash('sha256').update(file.buffer).digest('hex'),
          storageKey: key,
          uploadedById: ctx.actor!.id,
        },
        { transaction },
      );
      await recordAudit(ctx, transaction, {
        action: 'attachment.uploaded',
        entity: 'attachment',
        entityId: a.id,
        after: { fileName: a.fileName, mimeType: a.mimeType, sizeBytes: a.sizeBytes, sha256: a.sha256 },
      });
      return presentAttachment(a);
    });
  } catch (err) {
    await store.remove(key);
    throw err;
  }
}

/**
 * Attaches the uploader's pending photos to a record, inside the record's own transaction. A record
 * takes photos only, unless it accepts documents too (`documents`): a PDF never lands among a
 * part's photos.
 */
export async function claimUploads(
  ctx: Ctx,
  transaction: Transaction,
  ids: number[],
  entity: string,
  entityId: string | number,
  { documents = false, field = 'photoIds' }: { documents?: boolean; field?: string } = {},
): Promise<void> {
  if (!ids.length) return;
  const unique = [...new Set(ids)];
  const types = Object.keys(documents ? { ...IMAGE_TYPES, ...DOCUMENT_TYPES } : IMAGE_TYPES);
  const [count] = await Attachment.update(
    { entity, entityId: String(entityId) },
    {
      where: { id: { [Op.in]: unique }, entity: 'pending', uploadedById: ctx.actor!.id, mimeType: { [Op.in]: types } },
      transaction,
    },
  );
  if (count !== unique.length) {
    throw invalid(`A ${documents ? 'file' : 'photo'} could not be attached: upload it again.`, {
      [field]: documents ? 'Unknown or already used file.' : 'Unknown or already used photo (PDFs go with evidence).',
    });
  }
}

export async function readAttachment(store: BlobStore, id: number, viewerId: number) {
  const a = await Attachment.findByPk(id);
  // a pending upload is visible only to the person who uploaded it
  if (!a || (a.entity === 'pending' && a.uploadedById !== viewerId)) throw notFound('That file');
  const data = await store.get(a.storageKey);
  if (!data) throw notFound('That file');
  return { attachment: a, data };
}

export async function attachmentsOf(entity: string, entityId: string | number) {
  const rows = await Attachment.findAll({ where: { entity, entityId: String(entityId) }, order: [['id', 'ASC']] });
  return rows.map(presentAttachment);
}
