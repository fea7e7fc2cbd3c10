import type { Transaction } from 'sequelize';
import { dateIn, warrantyCover } from '../../../shared/domain/warranty.js';
import type { ShipmentJson, WarrantyJson } from '../../../shared/schemas/release.js';
import { Customer, User, type Shipment } from '../../models/index.js';
import { plantSettings } from '../plant.js';
import { readsTogether } from '../../read/reads-together.js';

/** A shipment as the trail and the release show it, with its warranty as of today at the plant. */

export function warrantyOf(shipDate: string, months: number, km: number | null, today: string): WarrantyJson {
  const cover = warrantyCover({ startsOn: shipDate, months, km }, today);
  return {
    months,
    km,
    startsOn: shipDate,
    endsOn: cover.endsOn,
    inWarranty: cover.covered,
    daysLeft: cover.daysLeft,
    reason: cover.reason,
  };
}

export async function presentShipment(s: Shipment, transaction?: Transaction): Promise<ShipmentJson> {
  const [customer, by, plant] = await readsTogether(transaction, [
    () => (s.customerId ? Customer.findByPk(s.customerId, { transaction }) : null),
    () => User.findByPk(s.releasedById, { attributes: ['name'], transaction }),
    () => plantSettings(transaction),
  ]);
  const shipDate = s.shipDate ?? dateIn(plant.timeZone, s.shippedAt);
  return {
    customer: customer ? { code: customer.code, name: customer.name } : null,
    reference: s.reference,
    carrier: s.carrier,
    shipDate,
    releasedBy: by?.name ?? '',
    releasedAt: s.shippedAt.toISOString(),
    warranty: warrantyOf(shipDate, s.warrantyMonths ?? 0, s.warrantyKm, dateIn(plant.timeZone, new Date())),
  };
}
