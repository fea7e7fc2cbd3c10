import type { Sequelize } from 'sequelize';
import type { Api } from '../http/api.js';

export function healthRoutes(api: Api, sequelize: Sequelize) {
  api.define({
    method: 'get',
    path: '/health',
    access: 'public',
    summary: 'Liveness and database reachability.',
    handler: async ({ res }) => {
      try {
        await sequelize.query('SELECT 1');
        return { ok: true, db: 'up' };
      } catch {
        res.status(503).json({ ok: false, db: 'down' });
        return undefined;
      }
    },
  });
}
