import { QueryTypes, type Sequelize } from 'sequelize';
import { recordAudit, systemCtx } from '../../audit.js';
import { Route } from '../../models/index.js';

const DUE_SQL = `SELECT id, version, status, active, effective_from <= now() AS started, superseded_at <= now() AS ended
  FROM routes
 WHERE status = 'approved'
   AND ((NOT active AND effective_from <= now() AND (superseded_at IS NULL OR superseded_at > now()))
     OR superseded_at <= now())
 ORDER BY id`;

/**
 * Brings the stored state of route versions up to the clock: a version approved to take effect
 * later becomes the one in force (`active`) when its time comes, and the one it replaces is marked
 * superseded. The times decide what a station reads (reference-cache); the line reads and the
 * document export read the flag, so it must follow. Run by each read of the routes and by a job
 * (RouteClock); a run with nothing due writes nothing, so the reference version is not bumped.
 */
export async function settleRouteVersions(sequelize: Sequelize): Promise<number> {
  const due = await sequelize.query<{ id: number }>(DUE_SQL, { type: QueryTypes.SELECT });
  if (!due.length) return 0;
  return sequelize.transaction(async (transaction) => {
    const rows = await sequelize.query<{ id: number; version: number; started: boolean; ended: boolean | null }>(
      `${DUE_SQL} FOR UPDATE`,
      { type: QueryTypes.SELECT, transaction },
    );
    const ctx = systemCtx();
    for (const r of rows) {
      const route = (await Route.findByPk(r.id, { transaction }))!;
      const before = { status: route.status, active: route.active };
      if (r.ended) {
        await route.update({ status: 'superseded', active: false }, { transaction });
        await recordAudit(ctx, transaction, {
          action: 'route.superseded',
          entity: 'route',
          entityId: route.id,
          before,
          after: { status: 'superseded', active: false, supersededAt: route.supersededAt },
        });
      } else {
        await route.update({ active: true }, { transaction });
        await recordAudit(ctx, transaction, {
          action: 'route.took_effect',
          entity: 'route',
          entityId: route.id,
          before,
          after: { status: route.status, active: true, effectiveFrom: route.effectiveFrom },
        });
      }
    }
    return rows.length;
  });
}
