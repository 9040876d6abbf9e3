import 'server-only';
import { z } from 'zod';

/**
 * Server environment, validated once at start-up. A missing or malformed variable stops the
 * process with a message that names it, instead of failing later inside a request.
 * Client code never imports this file: the app has no public (browser) variables.
 */
const serverSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  DATABASE_URL: z.string().url('DATABASE_URL must be a postgres:// URL'),
  AUTH_SECRET: z.string().min(32, 'AUTH_SECRET must be at least 32 characters (npm start generates one)'),
  APP_URL: z.string().url().default('http://localhost:3000'),
  SMTP_HOST: z.string().min(1).default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
  SMTP_SECURE: z
    .enum(['true', 'false'])
    .default('false')
    .transform((v) => v === 'true'),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  MAIL_FROM: z.string().min(3).default('Unitwise <no-reply@unitwise.local>'),
  TRUST_PROXY: z.enum(['true', 'false']).default('false'),
  /** Folder of the local mail sink. When set, the development outbox page is served. */
  OUTBOX_DIR: z.string().optional(),
});

export type ServerEnv = z.infer<typeof serverSchema>;

let cached: ServerEnv | undefined;

export function env(): ServerEnv {
  if (cached) return cached;
  const parsed = serverSchema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Invalid environment:\n${lines.join('\n')}\nSee .env.example.`);
  }
  cached = parsed.data;
  return cached;
}
