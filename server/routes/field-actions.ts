import type { Sequelize } from 'sequelize';
import { decideFieldActionBody, fieldActionListQuery, fieldActionParam } from '../../shared/schemas/field-actions.js';
import type { Api } from '../http/api.js';
import { decideFieldAction, fieldActionDetail, listFieldActions } from '../services/field-actions.js';

export function fieldActionRoutes(api: Api, sequelize: Sequelize) {
  api.define({
    method: 'get',
    path: '/field-actions',
    access: 'field-actions.read',
    summary: 'Problems found after a unit shipped, newest first; filter open or closed.',
    query: fieldActionListQuery,
    handler: ({ query }) => listFieldActions(sequelize, query),
  });
  api.define({
    method: 'get',
    path: '/field-actions/:number',
    access: 'field-actions.read',
    summary:
      'One field action: the shipped unit, its customer and order, the NCR behind it, the decision and signature.',
    params: fieldActionParam,
    handler: ({ params }) => fieldActionDetail(sequelize, params.number),
  });
  api.define({
    method: 'post',
    path: '/field-actions/:number/decide',
    access: 'field-actions.decide',
    summary:
      'Close a field action with a signed decision (no action, notify the customer, recall); a notice or recall is mailed to the customer on file.',
    params: fieldActionParam,
    body: decideFieldActionBody,
    limit: 'signature',
    handler: ({ ctx, params, body }) => decideFieldAction(sequelize, ctx, params.number, body),
  });
}
