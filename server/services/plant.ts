import type { Sequelize, Transaction } from 'sequelize';
import { todayIn } from '../../shared/domain/warranty.js';
import type { PlantJson, PlantBody } from '../../shared/schemas/plant.js';
import { recordAudit, type Ctx } from '../audit.js';
import { PlantSettings } from '../models/index.js';

/** The plant's one row of settings: its name and address for documents, and its calendar. */
export async function plantSettings(transaction?: Transaction): Promise<PlantSettings> {
  const row = await PlantSettings.findByPk(1, { transaction });
  // the migration writes the row; a database restored from before it still answers
  return row ?? PlantSettings.build({ id: 1, name: 'Remanufacturing plant', address: '', timeZone: 'UTC' });
}

/** Today as the plant's calendar has it (its time zone, not the server's or UTC). */
export async function plantToday(transaction?: Transaction): Promise<string> {
  return todayIn((await plantSettings(transaction)).timeZone);
}

export const presentPlant = (p: PlantSettings): PlantJson => ({
  name: p.name,
  address: p.address,
  timeZone: p.timeZone,
  today: todayIn(p.timeZone),
  ncrOverdueDays: p.ncrOverdueDays ?? 7,
  holdAlertHours: p.holdAlertHours ?? 48,
});

const settingsOf = ({ today: _today, ...rest }: PlantJson) => rest;

export async function updatePlant(sequelize: Sequelize, ctx: Ctx, body: PlantBody): Promise<PlantJson> {
  return sequelize.transaction(async (transaction) => {
    const row = (await PlantSettings.findByPk(1, { transaction, lock: transaction.LOCK.UPDATE }))!;
    const before = presentPlant(row);
    await row.update(body, { transaction });
    const after = presentPlant(row);
    await recordAudit(ctx, transaction, {
      action: 'plant.updated',
      entity: 'plant',
      entityId: 1,
      before: settingsOf(before),
      after: settingsOf(after),
    });
    return after;
  });
}
