import type { Sequelize } from 'sequelize';
import { lotCodeParam } from '../../shared/schemas/trail.js';
import { serialParam } from '../../shared/schemas/intake.js';
import type { Api } from '../http/api.js';
import type { ReadSide } from '../read-side.js';
import { lotLookup, trailOf } from '../services/trail/index.js';

/** A serial's whole history, and where a purchased lot went. */
export function trailRoutes(api: Api, sequelize: Sequelize, read: ReadSide) {
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
}
