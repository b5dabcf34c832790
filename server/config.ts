import { createHash } from 'node:crypto';
import { z } from 'zod';
import { DEFAULT_DATABASE_URL } from '../db/client';

const ConfigSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  PORT: z.coerce.number().int().min(0).max(65535).default(8080),
  HOST: z.string().min(1).default('127.0.0.1'),
  DATABASE_URL: z.string().regex(/^postgres(ql)?:\/\//, 'must be a postgres:// URL').default(DEFAULT_DATABASE_URL),
  /** Secret that signs session cookies. Generated per start when absent (sessions then end at restart of a fresh process with a new secret) — set it in production. */
  SESSION_SECRET: z.string().min(16, 'must be at least 16 characters').optional(),
  /** Mark cookies Secure (set when served over TLS, directly or behind a proxy). */
  COOKIE_SECURE: z
    .enum(['true', 'false'])
    .default('false')
    .transform((v) => v === 'true'),
  /** Minutes of inactivity before a session ends. */
  SESSION_IDLE_MINUTES: z.coerce.number().int().min(1).max(24 * 60).default(30),
  /** Folder with the web export served at / (single-page fallback). */
  WEB_DIST: z.string().default('dist'),
  /** Sign-in attempts allowed per client address per 15 minutes (on top of the per-address lock-out). */
  SIGN_IN_RATE_LIMIT: z.coerce.number().int().min(1).default(50),
  /** Public base URL used in links (invitations, password resets). */
  PUBLIC_URL: z.string().url().optional(),
  /** Outgoing mail server. Unset: a local stand-in on loopback keeps mail in the database instead. */
  SMTP_HOST: z.string().min(1).optional(),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(587),
  /** true for implicit TLS (port 465); otherwise STARTTLS is used when the server offers it. */
  SMTP_SECURE: z
    .enum(['true', 'false'])
    .default('false')
    .transform((v) => v === 'true'),
  SMTP_USER: z.string().optional(),
  SMTP_PASS: z.string().optional(),
  SMTP_FROM: z.string().min(3).default('Keelson <no-reply@keelson.local>'),
  /** Port of the local stand-in mail server when SMTP_HOST is unset (0: any free port). */
  LOCAL_SMTP_PORT: z.coerce.number().int().min(0).max(65535).default(0),
});

export type Config = z.infer<typeof ConfigSchema> & { SESSION_SECRET: string };

export function loadConfig(env: Record<string, string | undefined> = process.env): Config {
  const parsed = ConfigSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`invalid configuration:\n${lines.join('\n')}`);
  }
  const c = parsed.data;
  return { ...c, SESSION_SECRET: c.SESSION_SECRET ?? stableDevSecret(c.DATABASE_URL) };
}

/**
 * Without SESSION_SECRET we derive one from the database URL so that a
 * development restart keeps sessions valid; production must set its own.
 */
function stableDevSecret(dbUrl: string): string {
  return createHash('sha256').update(`keelson-dev:${dbUrl}`).digest('hex');
}
