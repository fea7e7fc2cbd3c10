import type { Sequelize } from 'sequelize';
import { idParam } from '../../shared/schemas/common.js';
import { createStationBody, familyBody, updateStationBody } from '../../shared/schemas/reference.js';
import type { Api } from '../http/api.js';
import {
  createFamily,
  createStation,
  listFamilies,
  listStages,
  listStations,
  updateFamily,
  updateStation,
} from '../services/reference.js';

export function referenceRoutes(api: Api, sequelize: Sequelize) {
  api.define({
    method: 'get',
    path: '/stages',
    access: 'reference.read',
    summary: 'Every stage (operation) a part can go through.',
    handler: () => listStages(),
  });
  api.define({
    method: 'get',
    path: '/stations',
    access: 'reference.read',
    summary: 'Stations on the floor and the stage each one records.',
    handler: () => listStations(),
  });
  api.define({
    method: 'post',
    path: '/stations',
    access: 'stations.manage',
    summary: 'Add a station.',
    body: createStationBody,
    status: 201,
    handler: ({ ctx, body }) => createStation(sequelize, ctx, body),
  });
  api.define({
    method: 'patch',
    path: '/stations/:id',
    access: 'stations.manage',
    summary: 'Rename a station, change its stage or take it out of service.',
    params: idParam,
    body: updateStationBody,
    handler: ({ ctx, params, body }) => updateStation(sequelize, ctx, params.id, body),
  });
  api.define({
    method: 'get',
    path: '/engine-families',
    access: 'reference.read',
    summary: 'Engine families with layout, bore, stroke and warranty term.',
    handler: () => listFamilies(),
  });
  api.define({
    method: 'post',
    path: '/engine-families',
    access: 'families.manage',
    summary: 'Add an engine family.',
    body: familyBody,
    status: 201,
    handler: ({ ctx, body }) => createFamily(sequelize, ctx, body),
  });
  api.define({
    method: 'put',
    path: '/engine-families/:id',
    access: 'families.manage',
    summary: "Replace an engine family's details.",
    params: idParam,
    body: familyBody,
    handler: ({ ctx, params, body }) => updateFamily(sequelize, ctx, params.id, body),
  });
}
