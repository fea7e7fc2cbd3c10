import multer from 'multer';
import type { Sequelize } from 'sequelize';
import { idParam } from '../../shared/schemas/common.js';
import { invalid } from '../errors.js';
import type { Api } from '../http/api.js';
import { MAX_UPLOAD_BYTES, readAttachment, storeUpload } from '../services/attachments.js';
import type { BlobStore } from '../storage/blob-store.js';

export function attachmentRoutes(api: Api, sequelize: Sequelize, store: BlobStore) {
  // in memory, so nothing reaches the disk before its bytes have been checked
  const upload = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: MAX_UPLOAD_BYTES, files: 1, fields: 4, parts: 5 },
  }).single('file');

  api.define({
    method: 'post',
    path: '/attachments',
    access: 'attachments.upload',
    summary: 'Upload one photo or PDF (multipart field "file"); attach it to a record by its id.',
    before: upload,
    status: 201,
    handler: async ({ req, ctx }) => {
      if (!req.file) throw invalid('Choose a photo to upload.', { file: 'No file was sent.' });
      return storeUpload(sequelize, store, ctx, req.file);
    },
  });

  api.define({
    method: 'get',
    path: '/attachments/:id',
    access: 'items.read',
    summary: 'The stored photo itself, with its checked Content-Type.',
    params: idParam,
    handler: async ({ params, user, res }) => {
      const { attachment, data } = await readAttachment(store, params.id, user!.id);
      res.setHeader('Content-Type', attachment.mimeType);
      res.setHeader('X-Content-Type-Options', 'nosniff');
      // a PDF is downloaded, never shown in the app's own origin
      const disposition = attachment.mimeType.startsWith('image/') ? 'inline' : 'attachment';
      res.setHeader('Content-Disposition', `${disposition}; filename="${attachment.fileName.replace(/"/g, '')}"`);
      res.setHeader('Cache-Control', 'private, max-age=3600');
      res.end(data);
      return undefined;
    },
  });
}
