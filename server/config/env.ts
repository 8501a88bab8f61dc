import { z } from 'zod';

const bool = z
  .enum(['true', 'false', '1', '0'])
  .optional()
  .transform((v) => v === 'true' || v === '1');

const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  DATABASE_URL: z.string().min(1, 'DATABASE_URL is required (npm start and npm test set it)'),
  SOWRIGHT_HOST: z.string().default('127.0.0.1'),
  SOWRIGHT_PORT: z.coerce.number().int().min(0).max(65535).default(4280),
  JWT_SECRET: z.string().min(32, 'JWT_SECRET must be at least 32 characters'),
  APP_URL: z.string().url().optional(),
  /** Starts the local SMTP catcher beside the app (development and demo). */
  SOWRIGHT_MAIL_FAKE: bool.default(true),
  SOWRIGHT_SMTP_HOST: z.string().default('127.0.0.1'),
  SOWRIGHT_SMTP_PORT: z.coerce.number().int().min(0).max(65535).default(4025),
  MAIL_FROM: z.string().default('Sowright <no-reply@sowright.invalid>'),
  /** Where files too large for the database are kept (as-applied logs), content-addressed. */
  SOWRIGHT_DATA_DIR: z.string().default('.data'),
  /** Serve the built client from this folder. */
  SOWRIGHT_CLIENT_DIR: z.string().optional(),
  /** Set when served over HTTPS: the cookie becomes __Host- prefixed and Secure. */
  COOKIE_SECURE: bool.default(false),
  /** Number of proxies in front of the app, for req.ip. 0 = none (default). */
  TRUST_PROXY: z.coerce.number().int().min(0).max(10).default(0),
});

export type Env = z.infer<typeof envSchema>;

/** Parses process.env once, with a message naming each bad variable. */
export function loadEnv(source: NodeJS.ProcessEnv = process.env): Env {
  const parsed = envSchema.safeParse(source);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Configuration is not valid:\n${lines.join('\n')}`);
  }
  return parsed.data;
}
