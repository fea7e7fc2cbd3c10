import type { Sequelize } from 'sequelize';
import { paperQuery, releaseBody } from '../../shared/schemas/release.js';
import { serialParam } from '../../shared/schemas/intake.js';
import type { Config } from '../config.js';
import { documentPdf, issueAfterRelease, issueReleaseDocuments, listDocuments } from '../documents/issue.js';
import type { Api } from '../http/api.js';
import { fileDisposition } from '../http/files.js';
import { signerFor } from '../ledger/signer.js';
import type { DocumentKind } from '../models/issued-document.js';
import { checkUnit, releaseUnit } from '../services/release/index.js';

/** The release gate, the signed release, and the documents issued with it. */
export function releaseRoutes(api: Api, sequelize: Sequelize, config: Config) {
  const ledger = { signer: signerFor(config.AUDIT_SIGNING_KEY), headIntervalMs: config.AUDIT_HEAD_INTERVAL_S * 1000 };
  const pdfRoute = (kind: DocumentKind, path: string, summary: string) =>
    api.define({
      method: 'get',
      path,
      access: 'trail.read',
      summary,
      params: serialParam,
      query: paperQuery,
      handler: async ({ params, query, res }) => {
        const { pdf, fileName } = await documentPdf(
          sequelize,
          params.serial,
          kind,
          query.paper === 'letter' ? 'LETTER' : 'A4',
          ledger,
        );
        res.setHeader('Content-Type', 'application/pdf');
        // named by the serial as stored, not as typed (an en dash or a line break cannot go in a header)
        res.setHeader('Content-Disposition', fileDisposition(fileName, 'inline'));
        res.send(pdf);
        return undefined;
      },
    });

  api.define({
    method: 'get',
    path: '/units/:serial/release-check',
    access: 'release.check',
    summary:
      'The release gate for a long block: every check, and each reason it cannot ship yet, in words with a link.',
    params: serialParam,
    handler: ({ params }) => checkUnit(sequelize, params.serial),
  });
  api.define({
    method: 'post',
    path: '/units/:serial/release',
    access: 'release.ship',
    summary:
      'Release a unit that passes the gate (checked again under its lock), signed with the password: the shipment and warranty start.',
    params: serialParam,
    body: releaseBody,
    limit: 'signature',
    status: 201,
    handler: async ({ ctx, params, body }) => {
      const released = await releaseUnit(sequelize, ctx, params.serial, body);
      return { ...released, documents: await issueAfterRelease(sequelize, ctx, params.serial) };
    },
  });
  api.define({
    method: 'get',
    path: '/units/:serial/documents',
    access: 'trail.read',
    summary:
      'The documents issued at release (build record, certificate of conformance, packing slip), with their hashes.',
    params: serialParam,
    handler: ({ params }) => listDocuments(params.serial),
  });
  api.define({
    method: 'post',
    path: '/units/:serial/documents',
    access: 'release.ship',
    summary:
      "Issue a released unit's documents if its release did not (each logged with its content hash); else list them.",
    params: serialParam,
    handler: ({ ctx, params }) => issueReleaseDocuments(sequelize, ctx, params.serial),
  });
  pdfRoute(
    'certificate',
    '/units/:serial/certificate.pdf',
    'The certificate of conformance issued at release, with the release signature and its log receipt (A4 or Letter).',
  );
  pdfRoute(
    'packing_slip',
    '/units/:serial/packing-slip.pdf',
    'The packing slip issued at release, with the release signature and its log receipt (A4 or Letter).',
  );
  pdfRoute(
    'build_record',
    '/units/:serial/build-record.pdf',
    "The unit's build record (A4 or Letter): as issued at release with its log receipt, or a draft before.",
  );
}
