import { Op, type Sequelize } from 'sequelize';
import { expandPositions } from '../../../shared/domain/positions.js';
import type { StationFormJson } from '../../../shared/schemas/results.js';
import { Item, Nonconformance, User } from '../../models/index.js';
import { gaugeChoices } from '../gauge-suitability.js';
import { findBySerial, presentItem } from '../items.js';
import { blockingNcrsOf } from '../ncrs/index.js';
import { referenceData } from '../reference-cache.js';
import { formCharacteristics } from '../spec/rules.js';
import { openReentry, stationByCode } from './common.js';
import { currentResultAt } from './current.js';
import { checkSequence } from './sequence.js';

/** Everything a station tablet needs to record one part: the check, the form and its rules. */
export async function stationForm(stationCode: string, serial: string): Promise<StationFormJson> {
  const ref = await referenceData(Item.sequelize as Sequelize);
  const { station, stage } = stationByCode(ref, stationCode);
  const item = await findBySerial(serial);
  const family = ref.family(item.engineFamilyId)!;
  const route = ref.routeOfItem(item);
  const [holds, reentry, current] = await Promise.all([
    blockingNcrsOf(item.id, stage.id),
    openReentry(item.id),
    currentResultAt(item.id, stage.id),
  ]);
  const characteristics = formCharacteristics(ref, stage.id, family.id, new Date(), (c) =>
    expandPositions(c.positions, family, item),
  );
  const gauges = gaugeChoices(ref, characteristics);
  const operator = current ? await User.findByPk(current.operatorId, { attributes: ['name'] }) : null;
  const rework = await Nonconformance.findOne({
    where: {
      itemId: item.id,
      state: 'decided',
      reworkStageId: stage.id,
      disposition: { [Op.in]: ['rework', 'repair'] },
    },
    order: [['id', 'DESC']],
  });
  return {
    station: { code: station.code, name: station.name, location: station.location },
    stage: {
      code: stage.code,
      name: stage.name,
      hazard: stage.hazard,
      description: stage.description,
      runTest: stage.runTest,
    },
    item: await presentItem(item, { route, ref }),
    sequence: checkSequence(item, stage, route, holds, reentry),
    holds,
    characteristics: characteristics.map(({ id: _id, defectCode: _d, ...c }) => c),
    gauges: gauges.choices,
    rework: rework
      ? { number: rework.number, disposition: rework.disposition!, reason: rework.dispositionReason ?? '' }
      : null,
    currentResult: current
      ? {
          id: current.id,
          verdict: current.verdict,
          finishedAt: current.finishedAt.toISOString(),
          operator: operator?.name ?? '',
        }
      : null,
  };
}
