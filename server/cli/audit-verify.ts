// `npm run audit:verify`: checks the whole audit trail (the old chain, every leaf against its event,
// the tree, every signed head) and says how far the Merkle log has integrated it. Exit 1 if broken.
import fs from 'node:fs';
import { createSequelize } from '../db.js';
import { signerFor } from '../ledger/signer.js';
import { verifyAudit } from '../ledger/verify.js';

const url = process.env.DATABASE_URL;
if (!url) {
  console.error('DATABASE_URL is not set (npm run audit:verify sets it from the project cluster).');
  process.exit(2);
}
const keyFile = '.data/audit-signing-key.pem';
const signer = signerFor(
  process.env.AUDIT_SIGNING_KEY ?? (fs.existsSync(keyFile) ? fs.readFileSync(keyFile, 'utf8') : undefined),
);
const sequelize = createSequelize(url, { poolMax: 1 });
try {
  const r = await verifyAudit(sequelize, { signer });
  const log = r.log;
  console.log(`chained history (before the log): ${r.chain.checked} events`);
  console.log(
    `Merkle log: ${log.treeSize} entries integrated${log.integratedAt ? ` (last at ${log.integratedAt})` : ''}, ` +
      `${log.pending} waiting${log.oldestPendingAt ? ` (oldest queued ${log.oldestPendingAt})` : ''}`,
  );
  console.log(`root ${log.rootHash}`);
  console.log(
    log.latestHead
      ? `signed heads: ${r.heads.total}, ${r.heads.checked} roots recomputed; latest covers ${log.latestHead.treeSize} ` +
          `entries, signed ${new Date(log.latestHead.timestamp).toISOString()} by key ${log.latestHead.keyId.slice(0, 16)}…`
      : 'signed heads: none yet',
  );
  if (!signer) console.log(`(no plant key given: signatures were checked against each head's own key)`);
  if (r.ok) console.log(`audit trail intact: ${r.checked} events checked against the log`);
  else {
    const b = r.firstBroken!;
    console.log(`audit trail BROKEN${b.id !== null ? ` at event ${b.id}` : ''}: ${b.reason}`);
    process.exitCode = 1;
  }
} finally {
  await sequelize.close();
}
