import { z } from 'zod';

const schema = z.object({
  DATABASE_URL: z.string().min(1, 'DATABASE_URL is required (npm start sets it).'),
  PORT: z.coerce.number().int().min(0).max(65535).default(4310),
  HOST: z.string().default('127.0.0.1'),
  JWT_SECRET: z.string().min(32, 'JWT_SECRET must be at least 32 characters.'),
  SESSION_HOURS: z.coerce.number().positive().default(12),
  BCRYPT_COST: z.coerce.number().int().min(4).max(15).default(12),
  SECURE_COOKIES: z.enum(['auto', 'always', 'never']).default('auto'),
  LOGIN_LIMIT_PER_ACCOUNT: z.coerce.number().int().positive().default(5),
  LOGIN_LIMIT_PER_ADDRESS: z.coerce.number().int().positive().default(30),
  LOGIN_LIMIT_WINDOW_MIN: z.coerce.number().positive().default(15),
  CLIENT_DIR: z.string().optional(),
  // uploaded photos: outside any folder the server serves; read back only through /api/attachments
  UPLOAD_DIR: z.string().default('.data/uploads'),
  SEED_DEMO: z.enum(['auto', 'never']).default('auto'),
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
