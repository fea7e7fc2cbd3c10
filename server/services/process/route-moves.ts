import type { Sequelize } from 'sequelize';
import { recordAudit, type Ctx } from '../../audit.js';
import { conflict, invalid } from '../../errors.js';
import { Route } from '../../models/index.js';
import { findBySerial } from '../items.js';

/** Quality moves one part to another approved version of its route, with a reason on record. */
export async function moveItemToRoute(
  sequelize: Sequelize,
  ctx: Ctx,
  serial: string,
  body: { routeId: number; reason: string },
) {
  return sequelize.transaction(async (transaction) => {
    const item = await findBySerial(serial, transaction, { lock: true });
    const route = await Route.findByPk(body.routeId, { transaction });
    if (!route || route.engineFamilyId !== item.engineFamilyId || route.partKind !== item.kind) {
      throw invalid(`Choose a version of this part's own route (${item.kind}).`, { routeId: 'Not this route.' });
    }
    if (route.status !== 'approved' && route.status !== 'superseded') {
      throw conflict(`Version ${route.version} is ${route.status}: a part moves only to an approved version.`);
    }
    if (route.id === item.routeId) throw conflict(`${item.serial} is already on version ${route.version}.`);
    const beforeRoute = item.routeId ? await Route.findByPk(item.routeId, { transaction }) : null;
    await item.update({ routeId: route.id }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'item.route_moved',
      entity: 'item',
      entityId: item.serial,
      before: { routeId: beforeRoute?.id ?? null, version: beforeRoute?.version ?? null },
      after: { routeId: route.id, version: route.version, reason: body.reason },
    });
    return { serial: item.serial, routeId: route.id, version: route.version };
  });
}
