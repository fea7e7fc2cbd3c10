import type { Sequelize } from 'sequelize';
import { z } from 'zod';
import { parseRunCsv } from '../../shared/domain/run-csv.js';
import {
  buildBody,
  lotCodeParam,
  paperQuery,
  releaseBody,
  replacePartBody,
  runCsvBody,
} from '../../shared/schemas/build.js';
import { serialParam } from '../../shared/schemas/intake.js';
import { AppError } from '../errors.js';
import type { Api } from '../http/api.js';
import { fileDisposition } from '../http/files.js';
import { EngineFamily } from '../models/index.js';
import { buildUnit, replacePart } from '../services/build.js';
import type { Config } from '../config.js';
import { documentPdf, issueAfterRelease, issueReleaseDocuments, listDocuments } from '../documents/issue.js';
import type { DocumentKind } from '../models/issued-document.js';
import { signerFor } from '../ledger/signer.js';
import { findBySerial } from '../services/items.js';
import { checkUnit, releaseUnit } from '../services/release.js';
import { lotLookup, trailOf } from '../services/trail.js';
import type { ReadSide } from '../read-side.js';

export function unitRoutes(api: Api, sequelize: Sequelize, config: Config, read: ReadSide) {
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
    method: 'post',
    path: '/units',
    access: 'assembly.record',
    summary:
      'Start a long block from a finished block, crankshaft and heads plus purchased lots; every refusal is listed (409).',
    body: buildBody,
    status: 201,
    handler: ({ ctx, body }) => buildUnit(sequelize, ctx, body),
  });
  api.define({
    method: 'post',
    path: '/units/:serial/replace',
    access: 'assembly.record',
    summary:
      'Take a part out of a built unit and fit another (who, when, why kept); the unit goes back to assembly. Refusals listed (409).',
    params: serialParam,
    body: replacePartBody,
    handler: ({ ctx, params, body }) => replacePart(sequelize, ctx, params.serial, body),
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
  api.define({
    method: 'get',
    path: '/trail/:serial',
    access: 'trail.read',
    summary:
      'Everything about a serial: genealogy tree, every result with readings and rule versions, NCRs, lots, shipment, warranty.',
    params: serialParam,
    handler: ({ params }) => trailOf(sequelize, params.serial, read),
  });
  api.define({
    method: 'get',
    path: '/lots/:lotCode',
    access: 'trail.read',
    summary: 'A purchased lot code: every unit it went into, with ship dates and customers.',
    params: lotCodeParam,
    handler: ({ params }) => lotLookup(read, params.lotCode),
  });
  api.define({
    method: 'post',
    path: '/run-test/parse',
    access: 'results.record',
    summary:
      "Read a test stand's CSV export into run-test readings; a malformed file is refused with its line and column.",
    body: runCsvBody.extend({ serial: z.string().trim().min(1).max(24) }),
    handler: async ({ body }) => {
      const item = await findBySerial(body.serial);
      const family = (await EngineFamily.findByPk(item.engineFamilyId))!;
      const parsed = parseRunCsv(body.csv, family.cylinders);
      if (!parsed.ok) {
        throw new AppError(
          'invalid_csv',
          parsed.message,
          { csv: parsed.message },
          { line: parsed.line, column: parsed.column },
        );
      }
      return { readings: parsed.readings };
    },
  });
}
