import type { Sequelize } from 'sequelize';
import { inspectionBody, lotIdParam, lotListQuery, receiveLotBody } from '../../shared/schemas/lots.js';
import type { Api } from '../http/api.js';
import { listLots, lotDetail, receiveLot, setInspection } from '../services/lots.js';

export function receivingRoutes(api: Api, sequelize: Sequelize) {
  api.define({
    method: 'get',
    path: '/receiving/lots',
    access: 'lots.read',
    summary:
      'Received purchased lots, newest first: quantity left, inspection, certificate; filter by code, supplier, state.',
    query: lotListQuery,
    handler: ({ query }) => listLots(query),
  });
  api.define({
    method: 'post',
    path: '/receiving/lots',
    access: 'lots.receive',
    summary:
      'Receive a purchased lot: supplier, part number, lot code (once per supplier and part number), quantity, date, certificate, inspection.',
    body: receiveLotBody,
    status: 201,
    handler: ({ ctx, body }) => receiveLot(sequelize, ctx, body),
  });
  api.define({
    method: 'get',
    path: '/receiving/lots/:id',
    access: 'lots.read',
    summary: 'One received lot: what came in, its inspection and certificate, and every unit drawn from it.',
    params: lotIdParam,
    handler: ({ params }) => lotDetail(params.id),
  });
  api.define({
    method: 'post',
    path: '/receiving/lots/:id/inspection',
    access: 'lots.inspect',
    summary: 'Accept a lot, put it on hold or refuse it, with the reason; a held or refused lot cannot be drawn.',
    params: lotIdParam,
    body: inspectionBody,
    handler: ({ ctx, params, body }) => setInspection(sequelize, ctx, params.id, body),
  });
}
