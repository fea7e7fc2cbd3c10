import type { Sequelize } from 'sequelize';
import { createPartyBody } from '../../shared/schemas/reference.js';
import type { Api } from '../http/api.js';
import { Customer, Supplier } from '../models/index.js';
import { createParty } from '../services/parties.js';

export function partyRoutes(api: Api, sequelize: Sequelize) {
  api.define({
    method: 'get',
    path: '/customers',
    access: 'reference.read',
    summary: 'Customers who return cores and buy engines.',
    handler: async () =>
      (await Customer.findAll({ order: [['name', 'ASC']] })).map((c) => ({ id: c.id, code: c.code, name: c.name })),
  });
  api.define({
    method: 'post',
    path: '/customers',
    access: 'process.edit',
    summary: 'Add a customer (code, name, e-mail for notices).',
    body: createPartyBody,
    status: 201,
    handler: ({ ctx, body }) => createParty(sequelize, ctx, 'customer', body),
  });
  api.define({
    method: 'get',
    path: '/suppliers',
    access: 'reference.read',
    summary: 'Suppliers of cores and purchased part lots.',
    handler: async () =>
      (await Supplier.findAll({ order: [['name', 'ASC']] })).map((s) => ({ id: s.id, code: s.code, name: s.name })),
  });
  api.define({
    method: 'post',
    path: '/suppliers',
    access: 'process.edit',
    summary: 'Add a supplier of cores or purchased part lots (code, name, e-mail).',
    body: createPartyBody,
    status: 201,
    handler: ({ ctx, body }) => createParty(sequelize, ctx, 'supplier', body),
  });
}
