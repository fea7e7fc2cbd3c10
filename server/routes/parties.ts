import type { Api } from '../http/api.js';
import { Customer, Supplier } from '../models/index.js';

export function partyRoutes(api: Api) {
  api.define({
    method: 'get',
    path: '/customers',
    access: 'reference.read',
    summary: 'Customers who return cores and buy engines.',
    handler: async () =>
      (await Customer.findAll({ order: [['name', 'ASC']] })).map((c) => ({ id: c.id, code: c.code, name: c.name })),
  });
  api.define({
    method: 'get',
    path: '/suppliers',
    access: 'reference.read',
    summary: 'Suppliers of cores and purchased part lots.',
    handler: async () =>
      (await Supplier.findAll({ order: [['name', 'ASC']] })).map((s) => ({ id: s.id, code: s.code, name: s.name })),
  });
}
