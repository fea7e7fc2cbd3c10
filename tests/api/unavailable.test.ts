import express from 'express';
import pg from 'pg';
import { DatabaseError, QueryTypes, UniqueConstraintError, type Sequelize } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createSequelize, isDatabaseUnreachable } from '../../server/db.js';
import { errorHandler } from '../../server/middleware/errors.js';
import { requestId } from '../../server/middleware/request-id.js';

// The errors PostgreSQL and the driver raise when a connection is lost under a request, made for
// real: the request's own server process is ended with pg_terminate_backend (what a fast shutdown
// does to every session). Each must reach the client as 503 `unavailable` with Retry-After, so a
// station retries with the same idempotency key, never as a 500 it would take as final.

let sequelize: Sequelize;
let admin: pg.Client;
let app: express.Express;
const warnings: string[] = [];
const originalWarn = console.warn;

const pidOf = async (transaction: unknown) => {
  const [row] = await sequelize.query<{ pid: number }>('SELECT pg_backend_pid() AS pid', {
    type: QueryTypes.SELECT,
    transaction: transaction as never,
  });
  return row!.pid;
};
const terminate = (pid: number) => admin.query('SELECT pg_terminate_backend($1)', [pid]);
const pause = (ms: number) => new Promise((r) => setTimeout(r, ms));

beforeAll(async () => {
  sequelize = createSequelize(process.env.DATABASE_URL!, { poolMax: 3 });
  admin = new pg.Client({ connectionString: process.env.DATABASE_URL });
  await admin.connect();
  // Sequelize announces a failed COMMIT with console.warn; the test reads it there
  console.warn = (...args: unknown[]) => void warnings.push(args.map(String).join(' '));
  app = express();
  app.use(requestId);
  // the connection is ended while a statement runs on it: 57P01 from the server
  app.post('/during-statement', async (_req, res) => {
    await sequelize.transaction(async (transaction) => {
      const pid = await pidOf(transaction);
      setTimeout(() => void terminate(pid), 150);
      await sequelize.query('SELECT pg_sleep(5)', { transaction });
    });
    res.json({ ok: true });
  });
  // ended while the transaction waits between statements: the next one finds the client broken
  app.post('/between-statements', async (_req, res) => {
    await sequelize.transaction(async (transaction) => {
      await terminate(await pidOf(transaction));
      await pause(300);
      await sequelize.query('SELECT 1', { transaction });
    });
    res.json({ ok: true });
  });
  // ended just before COMMIT: the driver cannot say whether the commit happened
  app.post('/at-commit', async (_req, res) => {
    await sequelize.transaction(async (transaction) => {
      await terminate(await pidOf(transaction));
      await pause(300);
    });
    res.json({ ok: true });
  });
  app.use(errorHandler);
});

afterAll(async () => {
  console.warn = originalWarn;
  await admin.end();
  await sequelize.close();
});

describe('when the database connection is lost under a request', () => {
  it('then a statement ended by "terminating connection due to administrator command" answers 503 unavailable with Retry-After', async () => {
    const res = await request(app).post('/during-statement');
    expect(res.status).toBe(503);
    expect(res.body.error.code).toBe('unavailable');
    expect(res.body.error.message).toMatch(/database is not reachable/);
    expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);
  });

  it('then the next statement on the broken client ("not queryable") answers 503 unavailable with Retry-After', async () => {
    const res = await request(app).post('/between-statements');
    expect(res.status).toBe(503);
    expect(res.body.error.code).toBe('unavailable');
    expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);
  });

  it('then a COMMIT left in an undetermined state answers 503 unavailable (a retry with the same key settles it)', async () => {
    warnings.length = 0;
    const res = await request(app).post('/at-commit');
    expect(warnings.join('\n')).toMatch(/undetermined state/);
    expect(res.status).toBe(503);
    expect(res.body.error.code).toBe('unavailable');
    expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);
  });

  it('then the pool heals: the next request on the same pool gets a new connection', async () => {
    const [row] = await sequelize.query<{ one: number }>('SELECT 1 AS one', { type: QueryTypes.SELECT });
    expect(row!.one).toBe(1);
  });
});

/** A driver error as pg makes it: a message and the server's SQLSTATE or Node's errno in `code`. */
const driverError = (message: string, code?: string) => Object.assign(new Error(message), code ? { code } : {});

describe('which errors mean "not reachable right now"', () => {
  // SQLSTATEs from the PostgreSQL 15 manual, Appendix A; errno names from Node's errors page;
  // the messages from pg 8.23 (lib/client.js), pg-pool and sequelize-pool, which the drill above
  // and the stopped-PostgreSQL drill cannot all provoke on demand
  it.each([
    [
      'cannot_connect_now, "the database system is shutting down"',
      driverError('the database system is shutting down', '57P03'),
    ],
    ['crash_shutdown', driverError('terminating connection because of crash of another server process', '57P02')],
    ['connection_failure', driverError('connection failure', '08006')],
    ['too_many_connections', driverError('sorry, too many clients already', '53300')],
    ['a reset socket', driverError('read ECONNRESET', 'ECONNRESET')],
    ['a connection that ended', driverError('Connection terminated unexpectedly')],
    ['a pool closing for shutdown', driverError('pool is draining and cannot accept work')],
    [
      "pg-pool's timeout, with the socket error as its cause",
      new Error('Connection terminated due to connection timeout', { cause: driverError('timeout expired') }),
    ],
  ])('when %s, then yes', (_what, err) => {
    expect(isDatabaseUnreachable(new DatabaseError(err as never))).toBe(true);
  });

  it.each([
    ['a unique violation', new UniqueConstraintError({ message: 'duplicate key value' })],
    [
      'invalid_text_representation',
      new DatabaseError(driverError('invalid input syntax for type integer', '22P02') as never),
    ],
    ['serialization_failure', new DatabaseError(driverError('could not serialize access', '40001') as never)],
    [
      'query_canceled (statement timeout)',
      new DatabaseError(driverError('canceling statement due to statement timeout', '57014') as never),
    ],
    ['a plain bug', new TypeError("Cannot read properties of undefined (reading 'id')")],
  ])('when %s, then no', (_what, err) => {
    expect(isDatabaseUnreachable(err)).toBe(false);
  });
});
