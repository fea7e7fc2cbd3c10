import { recordPassingResult } from '../db/seeders/demo-parts.js';
import { seedDemoIfEmpty } from '../db/seeders/demo.js';
import { DEMO_USERS, PLANT } from '../db/seeders/plant.js';
import { todayIn } from '../shared/domain/warranty.js';
import type { Ctx } from '../server/audit.js';
import { createSequelize } from '../server/db.js';
import { migrate } from '../server/migrate.js';
import { Customer, Item, User } from '../server/models/index.js';
import { releaseUnit } from '../server/services/release/index.js';

/**
 * The product's own records to copy: the demo plant (made through the services), and its second
 * unit — a six waiting for its run test — taken through run test, final inspection and release the
 * same way, so both families have a shipped unit to serve as a pattern.
 */
export async function prepareDatabase(url: string) {
  const sequelize = createSequelize(url, { poolMax: 4 });
  try {
    await migrate(sequelize);
    // the benchmark writes a plant's history of its own from the demo's units (history.ts)
    await seedDemoIfEmpty(sequelize, { bcryptCost: 10, history: false });
    const as = async (role: string): Promise<Ctx> => {
      const u = (await User.findOne({ where: { role, email: `${role}@larkspur.example` } }))!;
      return { actor: { id: u.id, role: u.role }, requestId: 'bench-prep' };
    };
    const waiting = await Item.findAll({ where: { kind: 'long_block', status: 'in_process' } });
    const operator = await as('operator');
    const customer = (await Customer.findOne({ order: [['id', 'ASC']] }))!;
    for (const unit of waiting) {
      for (const station of ['RT-1', 'FI-1']) await recordPassingResult(sequelize, operator, station, unit.serial);
      await releaseUnit(sequelize, await as('shipping'), unit.serial, {
        customerId: customer.id,
        reference: 'SO-PATTERN',
        shipDate: todayIn(PLANT.timeZone),
        carrier: 'Valley Freight',
        password: DEMO_USERS.find((u) => u.role === 'shipping')!.password,
      });
    }
  } finally {
    await sequelize.close();
  }
}
