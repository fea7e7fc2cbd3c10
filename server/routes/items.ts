import type { Sequelize } from 'sequelize';
import { paperQuery } from '../../shared/schemas/release.js';
import { labelsPrintedBody, serialParam } from '../../shared/schemas/intake.js';
import { travellerPdf } from '../documents/traveller.js';
import type { Api } from '../http/api.js';
import { fileDisposition } from '../http/files.js';
import { findBySerial, presentItem } from '../services/items.js';
import { labelPng, labelSvg, recordLabelPrints } from '../services/labels.js';

export function itemRoutes(api: Api, sequelize: Sequelize) {
  api.define({
    method: 'get',
    path: '/items/:serial',
    access: 'items.read',
    summary: 'Resolve a scanned or typed serial: kind, family, status and where it is on its route.',
    params: serialParam,
    handler: async ({ params }) => presentItem(await findBySerial(params.serial)),
  });
  api.define({
    method: 'get',
    path: '/items/:serial/traveller.pdf',
    access: 'items.read',
    summary:
      "A part's traveller: its serial as QR code and in large type, family, and its route with each stage's status.",
    params: serialParam,
    query: paperQuery,
    handler: async ({ params, query, res }) => {
      const { pdf, fileName } = await travellerPdf(params.serial, query.paper === 'letter' ? 'LETTER' : 'A4');
      res.setHeader('Content-Type', 'application/pdf');
      res.setHeader('Content-Disposition', fileDisposition(fileName, 'inline'));
      res.send(pdf);
      return undefined;
    },
  });
  api.define({
    method: 'get',
    path: '/items/:serial/label.svg',
    access: 'items.read',
    summary: "The item's QR code (encodes the serial) as SVG, for printing.",
    params: serialParam,
    handler: async ({ params, res }) => {
      const item = await findBySerial(params.serial);
      res.setHeader('Content-Type', 'image/svg+xml');
      res.setHeader('X-Content-Type-Options', 'nosniff');
      res.send(await labelSvg(item.serial));
      return undefined;
    },
  });
  api.define({
    method: 'get',
    path: '/items/:serial/label.png',
    access: 'items.read',
    summary: "The item's QR code as PNG, for download.",
    params: serialParam,
    handler: async ({ params, res }) => {
      const item = await findBySerial(params.serial);
      res.setHeader('Content-Type', 'image/png');
      res.setHeader('Content-Disposition', fileDisposition(`${item.serial}.png`, 'inline'));
      res.send(await labelPng(item.serial));
      return undefined;
    },
  });
  api.define({
    method: 'post',
    path: '/labels/printed',
    access: 'labels.print',
    summary: 'Log that labels were printed on a stock; a second print of a label is logged as a reprint.',
    body: labelsPrintedBody,
    handler: ({ ctx, body }) => recordLabelPrints(sequelize, ctx, body),
  });
}
