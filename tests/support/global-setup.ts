import { createSequelize } from '../../server/db.js';
import { migrate } from '../../server/migrate.js';
import { seedDemoIfEmpty } from '../../db/seeders/demo.js';

/** Once per run: migrate the test database and seed the demo plant (the browser suite signs in as it). */
export default async function setup() {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error('DATABASE_URL is not set: run the suites through `npm test`.');
  const sequelize = createSequelize(url);
  try {
    await migrate(sequelize);
    await seedDemoIfEmpty(sequelize);
  } finally {
    await sequelize.close();
  }
}
