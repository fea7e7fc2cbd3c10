import type { Sequelize } from 'sequelize';
import {
  duplicateQuery,
  intakeLogQuery,
  receiveCoreBody,
  serialParam,
  teardownBody,
} from '../../shared/schemas/intake.js';
import type { Api } from '../http/api.js';
import { sendCsv } from '../http/csv.js';
import { coreDetail, findDuplicates, intakeCsv, intakeLog, receiveCore } from '../services/intake.js';
import { tearDownCore } from '../services/teardown.js';

export function coreRoutes(api: Api, sequelize: Sequelize) {
  api.define({
    method: 'post',
    path: '/cores',
    access: 'intake.record',
    summary:
      'Log a core at the dock (accepted or rejected); it gets a serial. 409 possible_duplicate lists recent look-alikes.',
    body: receiveCoreBody,
    status: 201,
    handler: ({ ctx, body }) => receiveCore(sequelize, ctx, body),
  });
  api.define({
    method: 'get',
    path: '/cores',
    access: 'intake.read',
    summary: 'The intake log: filter by family, source, grade, accepted, date range or text; sort; page.',
    query: intakeLogQuery,
    handler: ({ query }) => intakeLog(sequelize, query),
  });
  api.define({
    method: 'get',
    path: '/cores/export.csv',
    access: 'intake.read',
    summary: 'The intake log with the same filters, every row, as CSV.',
    query: intakeLogQuery,
    handler: async ({ query, res }) => {
      const { rows } = await intakeLog(sequelize, query, { all: true });
      sendCsv(res, `intake-log-${new Date().toISOString().slice(0, 10)}.csv`, intakeCsv(rows));
      return undefined;
    },
  });
  api.define({
    method: 'get',
    path: '/cores/duplicates',
    access: 'intake.read',
    summary: 'Recent cores with the same ID number (or the same casting number and no ID number).',
    query: duplicateQuery,
    handler: ({ query }) => findDuplicates(sequelize, query.castingNumber, query.idNumber),
  });
  api.define({
    method: 'get',
    path: '/cores/:serial',
    access: 'intake.read',
    summary: 'One core: receipt, condition, credit decision, photos, teardown and the parts taken from it.',
    params: serialParam,
    handler: ({ params }) => coreDetail(params.serial),
  });
  api.define({
    method: 'post',
    path: '/cores/:serial/teardown',
    access: 'teardown.record',
    summary: 'Tear a received core down: serialize each kept part, record scrapped and discarded ones.',
    params: serialParam,
    body: teardownBody,
    status: 201,
    handler: ({ ctx, params, body }) => tearDownCore(sequelize, ctx, params.serial, body),
  });
}
