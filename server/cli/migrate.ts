// `npm run db:migrate`: applies pending migrations (the server also does this at start).
import { createSequelize } from '../db.js';
import { migrate } from '../migrate.js';

const sequelize = createSequelize(process.env.DATABASE_URL ?? '', { poolMax: 2 });
try {
  const applied = await migrate(sequelize);
  console.log(applied.length ? `applied: ${applied.join(', ')}` : 'no pending migrations');
} finally {
  await sequelize.close();
}
