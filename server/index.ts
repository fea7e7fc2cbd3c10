import type { Server } from 'node:http';
import { createApp } from './app.js';
import { loadConfig } from './config.js';
import { createSequelize } from './db.js';
import { migrate } from './migrate.js';
import { startMailSink } from './mail/sink.js';
import { MailWorker } from './mail/worker.js';
import { PartitionKeeper } from './jobs/reading-partitions.js';
import { RouteClock } from './jobs/route-clock.js';
import { UploadSweeper } from './jobs/upload-sweeper.js';
import { LocalDiskStore } from './storage/blob-store.js';
import { LedgerWorker } from './ledger/sequencer.js';
import { signerFor } from './ledger/signer.js';
import { OverdueReminderJob } from './services/corrective-action/reminders.js';
import { YieldDayCounter } from './services/line/yield-days.js';
import { DEMO_USERS, seedDemoIfEmpty } from '../db/seeders/demo.js';

async function main() {
  const config = loadConfig();
  const sequelize = createSequelize(config.DATABASE_URL, { poolMin: 2 });
  const applied = await migrate(sequelize);
  if (applied.length) console.log(`[api] applied migrations: ${applied.join(', ')}`);
  if (config.SEED_DEMO === 'auto') {
    const seeded = await seedDemoIfEmpty(sequelize, { bcryptCost: config.BCRYPT_COST });
    if (seeded) console.log('[api] the database was empty: demo plant seeded');
  }
  const sink =
    config.MAIL_SINK === 'on'
      ? await startMailSink({ port: config.SMTP_PORT, dir: config.MAIL_SINK_DIR }).catch((err: Error) => {
          throw new Error(
            `The local mail sink could not listen on 127.0.0.1:${config.SMTP_PORT} (${err.message}). Set SMTP_PORT to a free port.`,
          );
        })
      : null;
  if (sink) console.log(`[mail] loopback sink on 127.0.0.1:${sink.port}, keeping messages in ${sink.dir}`);
  const worker =
    config.MAIL_WORKER === 'on'
      ? new MailWorker(sequelize, { smtp: { host: config.SMTP_HOST, port: config.SMTP_PORT }, from: config.MAIL_FROM })
      : null;
  worker?.start();
  const store = new LocalDiskStore(config.UPLOAD_DIR);
  const sweeper = new UploadSweeper(sequelize, store, config.UNCLAIMED_UPLOAD_HOURS);
  sweeper.start();
  const partitions = new PartitionKeeper(sequelize);
  partitions.start();
  // a route version approved to take effect later comes into force on time
  const routeClock = new RouteClock(sequelize);
  routeClock.start();
  // the yield report sums closed plant days from yield_days: count them now and every ten minutes
  const yieldDays = new YieldDayCounter(sequelize);
  yieldDays.start();
  const signer = signerFor(config.AUDIT_SIGNING_KEY);
  if (!signer) console.log('[ledger] no AUDIT_SIGNING_KEY: the audit log is integrated but its heads are not signed');
  const ledger =
    config.LEDGER_WORKER === 'on'
      ? new LedgerWorker(sequelize, { signer, headIntervalMs: config.AUDIT_HEAD_INTERVAL_S * 1000 })
      : null;
  ledger?.start();
  const reminders = config.REMINDERS === 'on' ? new OverdueReminderJob(sequelize) : null;
  reminders?.start();
  // the trail and lot lookups read from a hot standby when one is named (docs/operations.md)
  const readDb = config.DATABASE_READ_URL
    ? createSequelize(config.DATABASE_READ_URL, { poolMin: 1, models: false })
    : null;
  if (readDb) console.log('[db] reading the trail and lot lookups from the standby in DATABASE_READ_URL');
  const app = createApp({ sequelize, config, store, read: readDb ? { db: readDb, standby: true } : undefined });
  const server: Server = await new Promise((resolve, reject) => {
    // Express 5 hands a listen error to this callback rather than only emitting it
    const s = app.listen(config.PORT, config.HOST, (err?: Error) => {
      if (!err) return resolve(s);
      if ((err as NodeJS.ErrnoException).code === 'EADDRINUSE') {
        reject(new Error(`Port ${config.PORT} on ${config.HOST} is already in use. Set PORT to a free port.`));
      } else reject(err);
    });
  });
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : config.PORT;
  const url = `http://${config.HOST}:${port}`;
  console.log(`\nCoretrail is running at ${url}\n`);
  console.log('Demo sign-ins (role, e-mail, password):');
  for (const u of DEMO_USERS) console.log(`  ${u.role.padEnd(11)} ${u.email.padEnd(30)} ${u.password}`);
  console.log('');
  console.log('Press Ctrl-C to stop.');
  // under `npm start`'s supervisor: tell it this start got as far as serving (it restarts only such)
  if (process.send) {
    process.send('listening');
    process.channel?.unref();
  }

  let stopping = false;
  const stop = (signal: string) => {
    if (stopping) return;
    stopping = true;
    console.log(`[api] ${signal}: finishing requests in flight, refusing new ones…`);
    app.state.draining = true;
    server.close(async () => {
      await reminders?.stop();
      await worker?.stop();
      await sweeper.stop();
      await partitions.stop();
      await routeClock.stop();
      await yieldDays.stop();
      await ledger?.stop();
      await sink?.close();
      await readDb?.close();
      await sequelize.close();
      console.log('[api] stopped');
      process.exit(0);
    });
    server.closeIdleConnections();
    setTimeout(() => {
      console.error('[api] requests still open after 10 s; closing them');
      server.closeAllConnections();
    }, 10_000).unref();
  };
  process.on('SIGINT', () => stop('SIGINT'));
  process.on('SIGTERM', () => stop('SIGTERM'));
}

main().catch((err: unknown) => {
  console.error(`[api] could not start: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
