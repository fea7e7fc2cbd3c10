import { z } from 'zod';

const schema = z.object({
  DATABASE_URL: z.string().min(1, 'DATABASE_URL is required (npm start sets it).'),
  /** A hot standby of DATABASE_URL's database: the trail, lot lookups, search and analytics read there. */
  DATABASE_READ_URL: z.string().min(1).optional(),
  PORT: z.coerce.number().int().min(0).max(65535).default(4310),
  HOST: z.string().default('127.0.0.1'),
  JWT_SECRET: z.string().min(32, 'JWT_SECRET must be at least 32 characters.'),
  SESSION_HOURS: z.coerce.number().positive().default(12),
  BCRYPT_COST: z.coerce.number().int().min(4).max(15).default(12),
  SECURE_COOKIES: z.enum(['auto', 'always', 'never']).default('auto'),
  LOGIN_LIMIT_PER_ACCOUNT: z.coerce.number().int().positive().default(5),
  LOGIN_LIMIT_PER_ADDRESS: z.coerce.number().int().positive().default(30),
  LOGIN_LIMIT_WINDOW_MIN: z.coerce.number().positive().default(15),
  // wrong passwords typed to sign a record or change one's own password, per person in that window
  PASSWORD_LIMIT_PER_PERSON: z.coerce.number().int().positive().default(5),
  // a session unused this long counts as signed out: office roles, and floor roles (a shift)
  IDLE_TIMEOUT_MIN: z.coerce.number().positive().default(30),
  SHIFT_HOURS: z.coerce.number().positive().default(8),
  // photos one person may upload in 24 hours; unclaimed photos are removed after this many hours
  UPLOAD_QUOTA_PER_DAY: z.coerce.number().int().positive().default(300),
  UNCLAIMED_UPLOAD_HOURS: z.coerce.number().positive().default(24),
  CLIENT_DIR: z.string().optional(),
  // uploaded photos: outside any folder the server serves; read back only through /api/attachments
  UPLOAD_DIR: z.string().default('.data/uploads'),
  SEED_DEMO: z.enum(['auto', 'never']).default('auto'),
  // e-mail: an SMTP server (for npm start and the tests, the loopback sink in server/mail/sink.ts)
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
  MAIL_FROM: z.string().default('Coretrail <coretrail@larkspur.example>'),
  MAIL_WORKER: z.enum(['on', 'off']).default('on'),
  // queue one reminder per overdue corrective-action action per plant day (safe in several processes)
  REMINDERS: z.enum(['on', 'off']).default('on'),
  // run the loopback SMTP sink in this process (npm start, npm run dev); never with a real relay
  MAIL_SINK: z.enum(['on', 'off']).default('off'),
  // where the loopback sink keeps what it received; the admin mail page reads it
  MAIL_SINK_DIR: z.string().default('.data/mail-sink'),
  // the address people open Coretrail at, for links in e-mail
  APP_URL: z.string().optional(),
  // the plant's Ed25519 key (PKCS #8 PEM) that signs the audit log's heads; npm start makes one in .data
  AUDIT_SIGNING_KEY: z.string().optional(),
  // how often a grown audit log gets a new signed head
  AUDIT_HEAD_INTERVAL_S: z.coerce.number().positive().default(60),
  // the sequencer that gives committed audit events their place in the log (one works at a time)
  LEDGER_WORKER: z.enum(['on', 'off']).default('on'),
});

export type Config = z.infer<typeof schema>;

export function loadConfig(env: NodeJS.ProcessEnv = process.env, overrides: Partial<Config> = {}): Config {
  const parsed = schema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Configuration is not complete:\n${lines.join('\n')}`);
  }
  return { ...parsed.data, ...overrides };
}
