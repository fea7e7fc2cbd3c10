// `npm run db:backup-key -- FILE`: a new age key for encrypting backups. The secret half goes to
// FILE (0600); the public half is printed, for BACKUP_AGE_RECIPIENTS on the server.
import { makeBackupKey } from '../ops/backup-keys.js';

const [file] = process.argv.slice(2);
if (!file) {
  console.error('usage: npm run db:backup-key -- FILE   (FILE must not exist; it receives the secret key)');
  process.exit(2);
}
const recipient = await makeBackupKey(file);
console.log(`secret key written to ${file} (mode 0600). Public key:\n\n  ${recipient}\n`);
console.log('On the server, put the public key in a file and point BACKUP_AGE_RECIPIENTS at it.');
console.log(`Keep ${file} off the server (the plant's safe, a password manager, a second site):`);
console.log('whoever holds it can read every backup, and without it nobody can.');
