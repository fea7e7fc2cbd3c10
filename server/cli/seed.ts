// `npm run db:seed`: seeds the demo plant when the database has no users yet.
import { seedDemoIfEmpty } from '../../db/seeders/demo.js';
import { createSequelize } from '../db.js';
import { migrate } from '../migrate.js';

const sequelize = createSequelize(process.env.DATABASE_URL ?? '', { poolMax: 2 });
try {
  await migrate(sequelize);
  console.log((await seedDemoIfEmpty(sequelize)) ? 'demo plant seeded' : 'the database already has users: not seeded');
} finally {
  await sequelize.close();
}
