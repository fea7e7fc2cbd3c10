import type { Transaction } from 'sequelize';
import { conflict, notFound } from '../../errors.js';
import { StageReentry } from '../../models/index.js';
import type { routeOfItem } from '../items.js';
import type { Reference } from '../reference-cache.js';
import type { formCharacteristics } from '../spec/rules.js';

export type Route = NonNullable<Awaited<ReturnType<typeof routeOfItem>>>;
export type FormChar = ReturnType<typeof formCharacteristics>[number];

export const lower = (s: string) => s.charAt(0).toLowerCase() + s.slice(1);

export function stationByCode(ref: Reference, code: string) {
  const station = ref.station(code.toUpperCase());
  if (!station || !station.active) throw notFound(`Station ${code}`);
  const stage = station.stageId ? ref.stage(station.stageId) : undefined;
  if (!stage) throw conflict(`Station ${station.code} records no stage: an admin can set its stage.`);
  return { station, stage };
}

/** The re-entry a supervisor allowed for the item and no result has used yet. */
export async function openReentry(itemId: number, transaction?: Transaction) {
  return StageReentry.findOne({ where: { itemId, usedByResultId: null }, transaction });
}
