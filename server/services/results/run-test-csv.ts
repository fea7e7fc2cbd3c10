import type { Sequelize } from 'sequelize';
import { expandPositions } from '../../../shared/domain/positions.js';
import { parseRunCsv } from '../../../shared/domain/run-csv.js';
import { AppError, conflict } from '../../errors.js';
import { Item } from '../../models/index.js';
import { findBySerial } from '../items.js';
import { referenceData } from '../reference-cache.js';
import { formCharacteristics } from '../spec/rules.js';

/**
 * A test stand's CSV export read into the readings of the unit's run test: the stage its route
 * marks as the run test, with that stage's characteristics as the plant defined them.
 */
export async function readRunTestCsv(serial: string, csv: string) {
  const ref = await referenceData(Item.sequelize as Sequelize);
  const item = await findBySerial(serial);
  const family = ref.family(item.engineFamilyId)!;
  const step = ref.routeOfItem(item)?.steps.find((s) => s.stage.runTest);
  if (!step)
    throw conflict(
      `${item.serial}'s route has no stage marked as the run test, so a test stand file has nowhere to go.`,
    );
  const chars = formCharacteristics(ref, step.stage.id, family.id, new Date(), (c) =>
    expandPositions(c.positions, family, item),
  );
  const parsed = parseRunCsv(csv, chars, family.cylinders);
  if (!parsed.ok) {
    throw new AppError(
      'invalid_csv',
      parsed.message,
      { csv: parsed.message },
      { line: parsed.line, column: parsed.column },
    );
  }
  return { readings: parsed.readings };
}
