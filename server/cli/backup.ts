// `npm run db:backup`: a timestamped pg_dump archive of the project database under backups/.
import path from 'node:path';
import { backupDatabase } from '../ops/backup.js';

const url = process.env.DATABASE_URL;
if (!url) {
  console.error('DATABASE_URL is not set (npm run db:backup sets it from the project cluster).');
  process.exit(2);
}
const stamp = new Date().toISOString().replace(/[-:]/g, '').replace('T', '-').slice(0, 15);
const dir = process.env.BACKUP_DIR ?? path.resolve('backups');
const { file, bytes } = backupDatabase(url, path.join(dir, `coretrail-${stamp}.dump`));
console.log(`backup written: ${file} (${(bytes / 1024).toFixed(0)} KiB)`);
