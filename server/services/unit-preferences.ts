import type { Sequelize } from 'sequelize';
import type { UnitPreferenceBody, UnitPreferencesJson } from '../../shared/schemas/unit-preferences.js';
import { UnitPreference } from '../models/index.js';

/**
 * Each person's preferred unit to type readings in, per characteristic unit: the station form
 * opens in it. A setting of the person's own, like a screen preference, so it is not audited; the
 * readings typed in it keep the unit they were typed in.
 */
export async function unitPreferences(userId: number): Promise<UnitPreferencesJson> {
  const rows = await UnitPreference.findAll({ where: { userId }, order: [['unit', 'ASC']] });
  return { preferences: Object.fromEntries(rows.map((r) => [r.unit, r.enteredUnit])) };
}

export async function setUnitPreference(
  sequelize: Sequelize,
  userId: number,
  body: UnitPreferenceBody,
): Promise<UnitPreferencesJson> {
  await sequelize.transaction(async (transaction) => {
    if (body.enteredUnit === null) {
      await UnitPreference.destroy({ where: { userId, unit: body.unit }, transaction });
      return;
    }
    await sequelize.query(
      `INSERT INTO unit_preferences (user_id, unit, entered_unit) VALUES (:userId, :unit, :enteredUnit)
       ON CONFLICT (user_id, unit) DO UPDATE SET entered_unit = EXCLUDED.entered_unit, updated_at = now()`,
      { replacements: { userId, unit: body.unit, enteredUnit: body.enteredUnit }, transaction },
    );
  });
  return unitPreferences(userId);
}
