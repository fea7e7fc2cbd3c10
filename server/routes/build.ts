import type { Sequelize } from 'sequelize';
import { buildBody, replacePartBody } from '../../shared/schemas/build.js';
import { serialParam } from '../../shared/schemas/intake.js';
import type { Api } from '../http/api.js';
import { buildUnit, replacePart } from '../services/build/index.js';

/** Building long blocks from finished parts and purchased lots, and replacing a part in one. */
export function buildRoutes(api: Api, sequelize: Sequelize) {
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
}
