import { ConnectionError, DataTypes, Sequelize } from 'sequelize';
import pg from 'pg';
import { initModels } from './models/index.js';

// Readings and limits are numeric(14,6): well inside a double's 15–17 significant digits, so they
// are plain numbers here. Sequelize installs its own NUMERIC parser (text) over pg's, hence both.
pg.types.setTypeParser(pg.types.builtins.NUMERIC, (v: string) => Number(v));
pg.types.setTypeParser(pg.types.builtins.INT8, (v: string) => Number(v));
(DataTypes as unknown as { postgres: { DECIMAL: { parse: (v: string) => number } } }).postgres.DECIMAL.parse = Number;

/**
 * `poolMin`: connections kept open while idle. The server keeps a couple, so the first scan after a
 * quiet spell does not pay for new connections (each starts with empty catalog caches).
 */
export function createSequelize(
  url: string,
  {
    poolMax = 10,
    poolMin = 0,
    models = true,
  }: {
    poolMax?: number;
    poolMin?: number;
    /** false for a second connection (the read side): the models stay bound to the primary's */
    models?: boolean;
  } = {},
): Sequelize {
  const sequelize = new Sequelize(url, {
    dialect: 'postgres',
    logging: false,
    pool: { max: poolMax, min: poolMin, acquire: 10_000, idle: 10_000 },
    define: { underscored: true },
    // JIT compiles a query that the planner thinks is big: 100 ms and more on the trail's queries
    // at a plant's size, to save microseconds. Short transactional queries never gain from it.
    dialectOptions: { connectionTimeoutMillis: 5_000, options: '-c jit=off' },
  });
  if (models) initModels(sequelize);
  return sequelize;
}

// SQLSTATEs that say the session is gone or cannot start now, not that the statement was wrong
// (PostgreSQL manual, Appendix A): class 08 connection exceptions; 57P01 admin_shutdown (a fast
// shutdown ends every session with it), 57P02 crash_shutdown, 57P03 cannot_connect_now (starting
// up or shutting down), 57P05 idle_session_timeout; 53300 too_many_connections.
const UNREACHABLE_SQLSTATE = /^(08...|57P0[1235]|53300)$/;
// socket errors (Node's errno names) on the way to the server
const UNREACHABLE_ERRNO = new Set([
  'ECONNREFUSED',
  'ECONNRESET',
  'EPIPE',
  'ETIMEDOUT',
  'EHOSTUNREACH',
  'ENETUNREACH',
  'ENOTFOUND',
  'EAI_AGAIN',
]);
// what pg, pg-pool, sequelize-pool and Sequelize say, without a code, when the connection or the
// pool is gone (their sources, pg 8.23 and Sequelize 6.37)
const UNREACHABLE_MESSAGE = [
  /^Connection terminated/, // …unexpectedly; …due to connection timeout
  /is not queryable$/, // Client has encountered a connection error and…; Client was closed and…
  /^timeout expired$/, // connectionTimeoutMillis
  /^pool is draining and cannot accept work$/, // this process is closing its pool
  /^ConnectionManager\.getConnection was called after the connection manager was closed/,
];

/**
 * True when an error means "the database is not reachable right now" rather than "this request
 * is wrong": the caller should try again, with the same idempotency key. Looks through the
 * wrappers (Sequelize keeps the driver's error as `parent`/`original`, pg-pool as `cause`). A
 * COMMIT that fails this way may or may not have committed; a retry with the same key settles it.
 */
export function isDatabaseUnreachable(err: unknown): boolean {
  const seen = new Set<unknown>();
  const queue: unknown[] = [err];
  while (queue.length) {
    const e = queue.shift();
    if (!e || typeof e !== 'object' || seen.has(e)) continue;
    seen.add(e);
    if (e instanceof ConnectionError) return true;
    const { code, message, parent, original, cause } = e as {
      code?: unknown;
      message?: unknown;
      parent?: unknown;
      original?: unknown;
      cause?: unknown;
    };
    if (typeof code === 'string' && (UNREACHABLE_SQLSTATE.test(code) || UNREACHABLE_ERRNO.has(code))) return true;
    if (typeof message === 'string' && UNREACHABLE_MESSAGE.some((m) => m.test(message))) return true;
    queue.push(parent, original, cause);
  }
  return false;
}
