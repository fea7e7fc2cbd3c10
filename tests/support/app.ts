import { randomBytes, randomUUID } from 'node:crypto';
import os from 'node:os';
import path from 'node:path';
import bcrypt from 'bcryptjs';
import jwt from 'jsonwebtoken';
import type { Sequelize } from 'sequelize';
import request from 'supertest';
import { createApp } from '../../server/app.js';
import { loadConfig, type Config } from '../../server/config.js';
import { createSequelize } from '../../server/db.js';
import { Session, User } from '../../server/models/index.js';
import { SESSION_COOKIE } from '../../server/middleware/authenticate.js';
import type { Role } from '../../shared/roles.js';
import { can } from '../../shared/permissions.js';

export const TEST_PASSWORD = 'correct horse battery';
// hashed once per run at the production cost, so each factory user is cheap to make
let testHash: string | null = null;
const hashOnce = async () => (testHash ??= await bcrypt.hash(TEST_PASSWORD, 12));

export function testConfig(overrides: Partial<Config> = {}): Config {
  return loadConfig(
    {
      ...process.env,
      JWT_SECRET: 'test-secret-'.padEnd(48, 'x'),
      SEED_DEMO: 'never',
      UPLOAD_DIR: path.join(os.tmpdir(), `coretrail-test-uploads-${process.pid}`),
    },
    overrides,
  );
}

export type TestApp = {
  app: ReturnType<typeof createApp>;
  sequelize: Sequelize;
  config: Config;
  close: () => Promise<void>;
};

/**
 * An in-process app on the test database. Models bind to one Sequelize instance per process, so a
 * second app in the same file passes the first one's `shared` instance (and does not close it).
 */
export function makeTestApp(overrides: Partial<Config> = {}, shared?: Sequelize): TestApp {
  const config = testConfig(overrides);
  const sequelize = shared ?? createSequelize(config.DATABASE_URL, { poolMax: 5 });
  const app = createApp({ sequelize, config });
  return { app, sequelize, config, close: async () => (shared ? undefined : sequelize.close()) };
}

export const unique = (prefix = 't') => `${prefix}${randomBytes(5).toString('hex')}`;

/**
 * A fresh active user of the given role, with TEST_PASSWORD. `quickSignature`: hashed at bcrypt's
 * lowest cost, for drills that sign hundreds of times where the signature is not what is tested.
 */
export async function makeUser(
  role: Role,
  extra: Partial<{ active: boolean; name: string; quickSignature: boolean; qualified: boolean }> = {},
) {
  const user = await User.create({
    email: `${unique(role)}@test.example`,
    name: extra.name ?? `Test ${role}`,
    role,
    passwordHash: extra.quickSignature ? await bcrypt.hash(TEST_PASSWORD, 4) : await hashOnce(),
    active: extra.active ?? true,
    lastSignInAt: null,
  });
  // people who record results are signed off for every stage, unless a test says otherwise
  if ((extra.qualified ?? true) && can(role, 'results.record')) await qualify(user);
  return user;
}

let trainer: User | null = null;

/**
 * Signs `user` off for stages (every stage by default) from `trainedOn` to `expiresOn`, as a
 * supervisor would: one signature row and one qualification per stage, written directly.
 */
export async function qualify(user: User, opts: { stages?: string[]; trainedOn?: string; expiresOn?: string } = {}) {
  const sequelize = User.sequelize!;
  trainer ??= await User.create({
    email: `${unique('trainer')}@test.example`,
    name: 'Test trainer',
    role: 'supervisor',
    passwordHash: await hashOnce(),
    lastSignInAt: null,
  });
  const day = (n: number) => new Date(Date.now() + n * 86_400_000).toISOString().slice(0, 10);
  await sequelize.query(
    `WITH sig AS (
       INSERT INTO signatures (user_id, printed_name, meaning, reason, entity, entity_id, signed_at)
       VALUES (:trainer, 'Test trainer', 'Qualified to record stages', 'test factory', 'qualification', :person, now())
       RETURNING id)
     INSERT INTO qualifications (user_id, stage_id, trained_on, expires_on, signed_by_id, signature_id)
     SELECT :person, s.id, :trainedOn, :expiresOn, :trainer, sig.id FROM stages s, sig
      WHERE :all OR s.code IN (:codes)`,
    {
      replacements: {
        trainer: trainer.id,
        person: user.id,
        trainedOn: opts.trainedOn ?? day(-30),
        expiresOn: opts.expiresOn ?? day(365),
        all: !opts.stages,
        codes: opts.stages?.length ? opts.stages : [''],
      },
    },
  );
}

/** A session cookie for a user, made directly (no bcrypt), exactly as sign-in makes one. */
export async function cookieFor(user: User, config: Config): Promise<string> {
  const id = randomUUID();
  await Session.create({
    id,
    userId: user.id,
    tokenVersion: user.tokenVersion,
    ip: null,
    userAgent: 'test',
    expiresAt: new Date(Date.now() + 3600_000),
    revokedAt: null,
  });
  const token = jwt.sign({ sid: id, tv: user.tokenVersion }, config.JWT_SECRET, {
    algorithm: 'HS256',
    subject: String(user.id),
    expiresIn: 3600,
  });
  return `${SESSION_COOKIE}=${token}`;
}

/** Signs in through the real endpoint and returns the Set-Cookie value. */
export async function signInCookie(t: TestApp, email: string, password = TEST_PASSWORD): Promise<string> {
  const res = await request(t.app).post('/api/auth/login').send({ email, password });
  if (res.status !== 200) throw new Error(`sign-in failed: ${res.status} ${JSON.stringify(res.body)}`);
  const raw = res.headers['set-cookie'] as unknown as string[];
  return raw[0]!.split(';')[0]!;
}
