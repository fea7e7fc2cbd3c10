// `npm run db:restore FILE [DATABASE]`: restores a backup into a fresh database and checks it. An
// encrypted backup (.age) needs BACKUP_AGE_IDENTITY, the plant's key file.
import { createSequelize } from '../db.js';
import { readIdentities } from '../ops/backup-keys.js';
import { restoreDatabase, rowCounts } from '../ops/backup.js';
import { verifyAudit } from '../ledger/verify.js';

const [file, name] = process.argv.slice(2);
const url = process.env.DATABASE_URL;
if (!file || !url) {
  console.error('usage: npm run db:restore FILE [DATABASE]   (the project cluster is started for you)');
  process.exit(2);
}
const admin = new URL(url);
admin.pathname = '/postgres';
const database = name ?? `coretrail_restored_${new Date().toISOString().replace(/\D/g, '').slice(0, 14)}`;
const identityFile = process.env.BACKUP_AGE_IDENTITY;
const identities = identityFile ? readIdentities(identityFile) : [];
const started = Date.now();
const restored = await restoreDatabase(admin.toString(), file, database, { identities });
const seconds = ((Date.now() - started) / 1000).toFixed(1);
const sequelize = createSequelize(restored.url, { poolMax: 1 });
try {
  const counts = await rowCounts(sequelize);
  const audit = await verifyAudit(sequelize);
  console.log(`restored into database ${database} in ${seconds} s`);
  for (const [t, n] of Object.entries(counts)) console.log(`  ${t.padEnd(28)} ${n}`);
  console.log(
    audit.ok
      ? `audit log intact: ${audit.checked} events in the log, ${audit.log.pending} waiting`
      : `audit log BROKEN${audit.firstBroken?.id ? ` at event ${audit.firstBroken.id}` : ''}: ${audit.firstBroken?.reason}`,
  );
  console.log(`\nTo run Coretrail on it: CORETRAIL_DB=${database} npm start`);
  if (!audit.ok) process.exitCode = 1;
} finally {
  await sequelize.close();
}
