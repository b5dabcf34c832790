import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { z } from 'zod';
import { DEFAULT_DATABASE_URL } from '../db/client';

const bool = (fallback: 'true' | 'false') =>
  z
    .enum(['true', 'false'], 'must be true or false')
    .default(fallback)
    .transform((v) => v === 'true');

const ConfigSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  PORT: z.coerce.number().int().min(0).max(65535).default(8080),
  HOST: z.string().min(1).default('127.0.0.1'),
  DATABASE_URL: z.string().regex(/^postgres(ql)?:\/\//, 'must be a postgres:// URL').default(DEFAULT_DATABASE_URL),
  /**
   * Secret that signs session cookies and one-use links. Required in production. In development
   * and tests a random secret is kept in .data/session-secret (git-ignored), so that the server
   * and the worker share it and a restart keeps sessions.
   */
  SESSION_SECRET: z.string().min(16, 'must be at least 16 characters').optional(),
  /** Mark cookies Secure (set when served over TLS, directly or behind a proxy). Required in production. */
  COOKIE_SECURE: bool('false'),
  /** Minutes of inactivity before a session ends. */
  SESSION_IDLE_MINUTES: z.coerce.number().int().min(1).max(24 * 60).default(30),
  /** Hours after sign-in when a session ends however active it was (absolute lifetime). */
  SESSION_ABSOLUTE_HOURS: z.coerce.number().min(0.01).max(24 * 30).default(12),
  /** Folder with the web export served at / (single-page fallback). */
  WEB_DIST: z.string().default('dist'),
  /** Sign-in attempts allowed per client address per 15 minutes (on top of the progressive delays). */
  SIGN_IN_RATE_LIMIT: z.coerce.number().int().min(1).default(50),
  /** Password-reset requests allowed per client address per 15 minutes. */
  FORGOT_PASSWORD_RATE_LIMIT: z.coerce.number().int().min(1).default(5),
  /**
   * The address people use to reach Keelson, e.g. https://keelson.example.org. Every link in an
   * e-mail (invitations, password resets, sign-in confirmations) is built from it — never from
   * the request's Host header. Required in production; in development it defaults to
   * http://HOST:PORT (localhost for 0.0.0.0).
   */
  PUBLIC_URL: z
    .string()
    .url('must be a URL such as https://keelson.example.org')
    .refine((u) => /^https?:\/\//.test(u), 'must start with http:// or https://')
    .optional(),
  /**
   * Which proxies in front of Keelson to believe about the client's address (X-Forwarded-For),
   * in Express's "trust proxy" syntax: `loopback` (default: a proxy on the same machine),
   * `false` (no proxy: use the connection's address), a number of hops, or addresses/CIDRs
   * separated by commas. Sign-in delays and rate limits key on this address.
   */
  TRUST_PROXY: z.string().min(1).default('loopback'),
  /** Outgoing mail server. Unset: a local stand-in on loopback keeps mail in the database instead. */
  SMTP_HOST: z.string().min(1).optional(),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(587),
  /** true for implicit TLS (port 465); otherwise STARTTLS is used when the server offers it. */
  SMTP_SECURE: bool('false'),
  SMTP_USER: z.string().optional(),
  SMTP_PASS: z.string().optional(),
  SMTP_FROM: z.string().min(3).default('Keelson <no-reply@keelson.local>'),
  /** Port of the local stand-in mail server when SMTP_HOST is unset (0: any free port). */
  LOCAL_SMTP_PORT: z.coerce.number().int().min(0).max(65535).default(0),
});

export type Config = Omit<z.infer<typeof ConfigSchema>, 'SESSION_SECRET' | 'PUBLIC_URL' | 'TRUST_PROXY'> & {
  SESSION_SECRET: string;
  PUBLIC_URL: string;
  TRUST_PROXY: boolean | number | string;
};

/** What production refuses to start without, and why. */
function productionProblems(c: z.infer<typeof ConfigSchema>): string[] {
  const out: string[] = [];
  if (!c.SESSION_SECRET) out.push('SESSION_SECRET: is required in production (at least 16 random characters; it signs session cookies and links)');
  if (!c.PUBLIC_URL) out.push('PUBLIC_URL: is required in production (the https:// address people use; links in e-mails are built from it)');
  if (!c.COOKIE_SECURE) out.push('COOKIE_SECURE: must be true in production (serve Keelson over HTTPS, directly or behind a proxy)');
  return out;
}

export function loadConfig(env: Record<string, string | undefined> = process.env): Config {
  const parsed = ConfigSchema.safeParse(env);
  const lines = parsed.success ? [] : parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`);
  if (parsed.success && parsed.data.NODE_ENV === 'production') lines.push(...productionProblems(parsed.data));
  if (!parsed.success || lines.length) throw new Error(`invalid configuration:\n${lines.map((l) => `  ${l}`).join('\n')}`);
  const c = parsed.data;
  const host = c.HOST === '0.0.0.0' || c.HOST === '::' ? 'localhost' : c.HOST;
  return {
    ...c,
    SESSION_SECRET: c.SESSION_SECRET ?? localSecret(),
    PUBLIC_URL: (c.PUBLIC_URL ?? `http://${host}:${c.PORT}`).replace(/\/+$/, ''),
    TRUST_PROXY: trustProxy(c.TRUST_PROXY),
  };
}

function trustProxy(v: string): boolean | number | string {
  if (v === 'true') return true;
  if (v === 'false') return false;
  if (/^\d+$/.test(v)) return Number(v);
  return v;
}

/**
 * Development and tests without SESSION_SECRET: a random secret kept in a git-ignored file,
 * created on first use, so that the server and the worker process (which builds the links in
 * e-mails) agree on it. Production never gets here.
 */
function localSecret(): string {
  const file = path.resolve(process.env.KEELSON_STATE_DIR ?? '.data', 'session-secret');
  try {
    const s = fs.readFileSync(file, 'utf8').trim();
    if (s.length >= 32) return s;
  } catch {
    // Not there yet.
  }
  const secret = randomBytes(32).toString('hex');
  fs.mkdirSync(path.dirname(file), { recursive: true });
  try {
    fs.writeFileSync(file, secret, { mode: 0o600, flag: 'wx' });
    return secret;
  } catch {
    // Another process wrote it first: use theirs.
    return fs.readFileSync(file, 'utf8').trim();
  }
}
