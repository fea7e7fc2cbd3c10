import type { Sequelize } from 'sequelize';
import { unitPreferenceBody } from '../../shared/schemas/unit-preferences.js';
import type { Api } from '../http/api.js';
import { setUnitPreference, unitPreferences } from '../services/unit-preferences.js';

export function unitPreferenceRoutes(api: Api, sequelize: Sequelize) {
  api.define({
    method: 'get',
    path: '/auth/unit-preferences',
    access: 'signed-in',
    summary: 'The units you prefer to type readings in, per characteristic unit (the station form opens in them).',
    handler: ({ user }) => unitPreferences(user!.id),
  });
  api.define({
    method: 'put',
    path: '/auth/unit-preferences',
    access: 'signed-in',
    summary:
      'Remember the unit you type readings in where a characteristic is kept in another unit of its quantity; null forgets it.',
    body: unitPreferenceBody,
    handler: ({ user, body }) => setUnitPreference(sequelize, user!.id, body),
  });
}
