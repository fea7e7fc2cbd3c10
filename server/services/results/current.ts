import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { StageResult } from '../../models/index.js';

/**
 * The one definition of "the current result of an item at a stage": the newest result there that
 * no correction supersedes. Newest by when it was finished, then by id: a result kept on a tablet
 * and sent late (or a demo record written out of order) can carry a smaller finished time than its
 * id suggests, and the stage's state is what was finished last, not what was stored last. Ties (one
 * timestamp) go to the later row.
 *
 * A SELECT of `columns` from `stage_results r`, for use as a subquery or a LATERAL join; `itemId`
 * and `stageId` are SQL expressions (a replacement such as `:itemId`, or an outer column), `also`
 * an extra condition on `r`. The alias `x` is taken inside.
 */
export function currentResultSql({
  columns,
  itemId,
  stageId,
  also,
}: {
  columns: string;
  itemId: string;
  stageId: string;
  also?: string;
}): string {
  return `SELECT ${columns} FROM stage_results r
      WHERE r.item_id = ${itemId} AND r.stage_id = ${stageId}
        AND NOT EXISTS (SELECT 1 FROM stage_results x WHERE x.supersedes_id = r.id)${also ? `\n        AND ${also}` : ''}
      ORDER BY r.finished_at DESC, r.id DESC LIMIT 1`;
}

/** The current (not superseded) result of an item at a stage. */
export async function currentResultAt(itemId: number, stageId: number, transaction?: Transaction) {
  const [row] = await (StageResult.sequelize as Sequelize).query<{ id: number }>(
    currentResultSql({ columns: 'r.id', itemId: ':itemId', stageId: ':stageId' }),
    { type: QueryTypes.SELECT, replacements: { itemId, stageId }, transaction },
  );
  return row ? StageResult.findByPk(row.id, { transaction }) : null;
}
