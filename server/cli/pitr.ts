// `npm run db:pitr -- BASE_BACKUP TIME [FOLDER]`: a fresh cluster restored from a base backup and
// the project cluster's WAL archive, up to TIME; then checked (rows, audit chain) and stopped,
// ready to run with CORETRAIL_CLUSTER_DIR=FOLDER npm start. The cluster in use is not touched.
import fs from 'node:fs';
import path from 'node:path';
import { freePort, persistentClusterDir, walArchiveOf } from '../../db/cluster.mjs';
import { verifyAudit } from '../ledger/verify.js';
import { createSequelize } from '../db.js';
import { rowCounts } from '../ops/backup.js';
import { restoreToTime } from '../ops/pitr.js';

const [base, time, into] = process.argv.slice(2);
const targetTime = time ? new Date(time) : null;
if (!base || !targetTime || Number.isNaN(targetTime.getTime())) {
  console.error('usage: npm run db:pitr -- BASE_BACKUP_FOLDER "2026-12-03 14:59:00+01" [NEW_CLUSTER_FOLDER]');
  process.exit(2);
}
const projectDir = path.resolve(import.meta.dirname, '..', '..');
const source = process.env.CORETRAIL_CLUSTER_DIR
  ? path.resolve(process.env.CORETRAIL_CLUSTER_DIR)
  : persistentClusterDir(projectDir);
const archiveDir = process.env.CORETRAIL_WAL_ARCHIVE_DIR ?? walArchiveOf(path.join(source, 'pgdata'));
if (!archiveDir) {
  console.error(`The cluster in ${source} does not archive its WAL (CORETRAIL_WAL_ARCHIVE); nothing to replay.`);
  process.exit(1);
}
const stamp = new Date().toISOString().replace(/\D/g, '').slice(0, 14);
const dir = path.resolve(into ?? `${source}-restored-${stamp}`);
const database = process.env.CORETRAIL_DB ?? 'coretrail';
const port = await freePort();

const started = Date.now();
const { cluster, lastReplayed } = await restoreToTime({
  base: path.resolve(base),
  archiveDir,
  targetTime,
  dir,
  port,
  credentialsFile: path.join(source, 'credentials.json'),
});
const seconds = ((Date.now() - started) / 1000).toFixed(1);
const sequelize = createSequelize(cluster.url(database), { poolMax: 1 });
try {
  const counts = await rowCounts(sequelize);
  const audit = await verifyAudit(sequelize);
  console.log(`restored to ${targetTime.toISOString()} in ${seconds} s, into ${dir}`);
  if (lastReplayed) console.log(`the newest transaction kept committed at ${lastReplayed.toISOString()}`);
  for (const [t, n] of Object.entries(counts)) console.log(`  ${t.padEnd(28)} ${n}`);
  console.log(
    audit.ok
      ? `audit log intact: ${audit.checked} events in the log, ${audit.log.pending} waiting`
      : `audit log BROKEN${audit.firstBroken?.id ? ` at event ${audit.firstBroken.id}` : ''}: ${audit.firstBroken?.reason}`,
  );
  if (!audit.ok) process.exitCode = 1;
} finally {
  await sequelize.close();
  cluster.stop();
}
console.log(`\nTo run Coretrail on it: CORETRAIL_CLUSTER_DIR=${dir} CORETRAIL_PG_PORT=<a free port> npm start`);
if (!fs.existsSync(path.join(dir, 'pgdata'))) process.exitCode = 1;
