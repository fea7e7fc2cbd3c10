import type { Sequelize } from 'sequelize';
import { plantBody } from '../../shared/schemas/plant.js';
import type { Api } from '../http/api.js';
import { plantSettings, presentPlant, updatePlant } from '../services/plant.js';

export function plantRoutes(api: Api, sequelize: Sequelize) {
  api.define({
    method: 'get',
    path: '/plant',
    access: 'public',
    summary:
      "The plant's name, address and time zone, and today's date in its calendar (the sign-in page shows the name).",
    handler: async () => presentPlant(await plantSettings()),
  });
  api.define({
    method: 'patch',
    path: '/plant',
    access: 'plant.manage',
    summary: "Change the plant's name, address or time zone (audited).",
    body: plantBody,
    handler: ({ ctx, body }) => updatePlant(sequelize, ctx, body),
  });
}
