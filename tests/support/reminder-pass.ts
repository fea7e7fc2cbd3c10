import { createSequelize } from '../../server/db.js';
import { sendOverdueReminders } from '../../server/services/corrective-action/reminders.js';

/** One pass of the overdue reminders in a process of its own: `tsx reminder-pass.ts <day>`. */
const sequelize = createSequelize(process.env.DATABASE_URL!, { poolMax: 2 });
try {
  console.log(await sendOverdueReminders(sequelize, { today: process.argv[2] }));
} finally {
  await sequelize.close();
}
