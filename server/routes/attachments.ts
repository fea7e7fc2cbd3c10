import type { RequestHandler } from 'express';
import multer, { MulterError } from 'multer';
import type { Sequelize } from 'sequelize';
import { idParam } from '../../shared/schemas/common.js';
import type { Config } from '../config.js';
import { AppError, invalid } from '../errors.js';
import type { Api } from '../http/api.js';
import { fileDisposition } from '../http/files.js';
import {
  CERTIFICATE_TYPES,
  MAX_UPLOAD_BYTES,
  readAttachment,
  storeUpload,
  uploadsToday,
} from '../services/attachments.js';
import type { BlobStore } from '../storage/blob-store.js';

export function attachmentRoutes(api: Api, sequelize: Sequelize, store: BlobStore, config: Config) {
  // in memory, so nothing reaches the disk before its bytes have been checked
  const multipart = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: MAX_UPLOAD_BYTES, files: 1, fields: 4, parts: 5 },
    // browsers send a file name's UTF-8 bytes as they are (the HTML form rules), not Latin-1
    defParamCharset: 'utf8',
  }).single('file');
  // the form parser's own complaints (no boundary, a body cut short, a malformed part) are the sender's
  const upload: RequestHandler = (req, res, next) =>
    multipart(req, res, (err?: unknown) =>
      next(
        err === undefined || err instanceof MulterError
          ? err
          : new AppError('invalid_upload', 'The upload was cut short or malformed: send the photo again.', {
              file: 'The form data could not be read.',
            }),
      ),
    );

  api.define({
    method: 'post',
    path: '/attachments',
    access: 'attachments.upload',
    summary: 'Upload one photo or PDF (multipart field "file"); attach it to a record by its id.',
    file: true,
    before: upload,
    status: 201,
    handler: async ({ req, ctx, user }) => {
      if (!req.file) throw invalid('Choose a photo to upload.', { file: 'No file was sent.' });
      const quota = config.UPLOAD_QUOTA_PER_DAY;
      if ((await uploadsToday(user!.id)) >= quota) {
        throw new AppError(
          'upload_quota',
          `You have uploaded ${quota} photos in the last 24 hours, as many as one person may. Attach the photos you have, or ask an administrator.`,
        );
      }
      return storeUpload(sequelize, store, ctx, req.file);
    },
  });

  api.define({
    method: 'post',
    path: '/gauges/certificates',
    access: 'gauges.manage',
    summary:
      'Upload a calibration certificate (multipart field "file"), a PDF by its bytes; a calibration record claims it.',
    file: true,
    before: upload,
    status: 201,
    handler: async ({ req, ctx }) => {
      if (!req.file) throw invalid('Choose the certificate to upload.', { file: 'No file was sent.' });
      return storeUpload(sequelize, store, ctx, req.file, {
        types: CERTIFICATE_TYPES,
        code: 'not_a_pdf',
        message: 'A certificate is attached as a PDF. This file is not one.',
      });
    },
  });

  api.define({
    method: 'post',
    path: '/receiving/certificates',
    access: 'lots.receive',
    summary:
      'Upload a lot\'s certificate of conformance (multipart field "file"), a PDF by its bytes; receiving the lot claims it.',
    file: true,
    before: upload,
    status: 201,
    handler: async ({ req, ctx }) => {
      if (!req.file) throw invalid('Choose the certificate to upload.', { file: 'No file was sent.' });
      return storeUpload(sequelize, store, ctx, req.file, {
        types: CERTIFICATE_TYPES,
        code: 'not_a_pdf',
        message: 'A certificate of conformance is attached as a PDF. This file is not one.',
      });
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
      // a PDF is downloaded, never shown in the app's own origin; RFC 6266 with an RFC 8187
      // filename* for names outside Latin-1
      const disposition = attachment.mimeType.startsWith('image/') ? 'inline' : 'attachment';
      res.setHeader('Content-Disposition', fileDisposition(attachment.fileName, disposition));
      res.setHeader('Cache-Control', 'private, max-age=3600');
      res.end(data);
      return undefined;
    },
  });
}
