// `npm run audit:verify`: walks the audit hash chain and reports the first broken link.
import { verifyAuditChain } from '../audit.js';
import { createSequelize } from '../db.js';

const url = process.env.DATABASE_URL;
if (!url) {
  console.error('DATABASE_URL is not set (npm run audit:verify sets it from the project cluster).');
  process.exit(2);
}
const sequelize = createSequelize(url, { poolMax: 1 });
try {
  const report = await verifyAuditChain(sequelize);
  if (report.ok) {
    console.log(`audit chain intact: ${report.checked} events checked`);
  } else {
    console.log(
      `audit chain BROKEN at event ${report.firstBroken!.id}: ${report.firstBroken!.reason} ` +
        `(${report.checked} events before it are intact)`,
    );
    process.exitCode = 1;
  }
} finally {
  await sequelize.close();
}
