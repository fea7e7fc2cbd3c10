// `npm run db:basebackup`: a base backup of the project cluster (pg_basebackup) under
// backups/base/, the starting point for a point-in-time restore (npm run db:pitr).
import path from 'node:path';
import { archiveStatus, takeBaseBackup } from '../ops/pitr.js';

const url = process.env.DATABASE_URL;
if (!url) {
  console.error('DATABASE_URL is not set (npm run db:basebackup sets it from the project cluster).');
  process.exit(2);
}
const parent = path.join(process.env.BACKUP_DIR ?? path.resolve('backups'), 'base');
const started = Date.now();
const base = await takeBaseBackup(url, parent);
const status = await archiveStatus(url);
console.log(
  `base backup written: ${base.dir} (${(base.bytes / 1024 / 1024).toFixed(1)} MiB in ${((Date.now() - started) / 1000).toFixed(1)} s)`,
);
if (status.mode === 'off') {
  console.log(
    'Continuous archiving is OFF: this backup restores only to its own end. Start the cluster with\n' +
      'CORETRAIL_WAL_ARCHIVE=on (once; it is remembered) to restore to any time after it.',
  );
} else {
  console.log(`WAL archive: newest segment ${status.last ?? '(none yet)'}; ${status.failed} failed attempts so far.`);
  console.log(
    `Restore to a time after ${base.finishedAt} with: npm run db:pitr -- ${base.dir} "YYYY-MM-DD HH:MM:SS+TZ"`,
  );
}
