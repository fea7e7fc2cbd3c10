import type { Server } from 'node:http';
import { createApp } from './app.js';
import { loadConfig } from './config.js';
import { createSequelize } from './db.js';
import { migrate } from './migrate.js';
import { startMailSink } from './mail/sink.js';
import { MailWorker } from './mail/worker.js';
import { OverdueReminderJob } from './services/corrective-action/reminders.js';
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
  const reminders = config.REMINDERS === 'on' ? new OverdueReminderJob(sequelize) : null;
  reminders?.start();
  const app = createApp({ sequelize, config });
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

  let stopping = false;
  const stop = (signal: string) => {
    if (stopping) return;
    stopping = true;
    console.log(`[api] ${signal}: finishing requests in flight, refusing new ones…`);
    app.state.draining = true;
    server.close(async () => {
      await reminders?.stop();
      await worker?.stop();
      await sink?.close();
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
