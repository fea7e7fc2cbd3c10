// `npm run db:backup`: a timestamped pg_dump archive of the project database under backups/,
// 0600 in a 0700 folder; encrypted when BACKUP_AGE_RECIPIENTS names the plant's public key file.
import path from 'node:path';
import { readRecipients } from '../ops/backup-keys.js';
import { backupDatabase } from '../ops/backup.js';

const url = process.env.DATABASE_URL;
if (!url) {
  console.error('DATABASE_URL is not set (npm run db:backup sets it from the project cluster).');
  process.exit(2);
}
const recipientsFile = process.env.BACKUP_AGE_RECIPIENTS;
const recipients = recipientsFile ? readRecipients(recipientsFile) : [];
const stamp = new Date().toISOString().replace(/[-:]/g, '').replace('T', '-').slice(0, 15);
const dir = process.env.BACKUP_DIR ?? path.resolve('backups');
const name = `coretrail-${stamp}.dump${recipients.length ? '.age' : ''}`;
const started = Date.now();
const { file, bytes } = await backupDatabase(url, path.join(dir, name), { recipients });
const how = recipients.length
  ? `encrypted to ${recipients.length === 1 ? 'the key' : `${recipients.length} keys`} in ${recipientsFile}`
  : 'not encrypted: set BACKUP_AGE_RECIPIENTS to encrypt';
console.log(
  `backup written: ${file} (${(bytes / 1024).toFixed(0)} KiB in ${((Date.now() - started) / 1000).toFixed(1)} s; ${how})`,
);
