import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { and, desc, eq, isNull } from 'drizzle-orm';
import { createApp } from '../../server/app';
import { loadConfig, type Config } from '../../server/config';
import { linkSettings, tokenFor } from '../../server/auth/links';
import { createDb, type Db } from '../../db/client';
import { accessTokens } from '../../db/schema';
import { seedDemo } from '../../db/seed';
import { createTestDatabase } from './database';

export type TestServer = {
  url: string;
  baseUrl: string;
  db: Db;
  schemeId: string;
  secondSchemeId: string;
  config: Config;
  /**
   * The token of the newest live link of `kind` for `email` — what the person finds in the
   * e-mail (the token is never stored; it is recomputed from the row id and the secret).
   */
  tokenFor: (email: string, kind: 'invitation' | 'password_reset' | 'sign_in_confirmation') => Promise<string>;
  /** Stops the HTTP server and its pool, then starts a new app on the same database and port (a server restart). */
  restart: () => Promise<void>;
  close: () => Promise<void>;
};

/**
 * A database of this file's own, seeded with the demo scheme, and the real
 * app listening on an ephemeral port.
 */
export async function startTestServer(opts: { seed?: boolean; env?: Record<string, string>; database?: { url: string; drop: () => Promise<void> } } = {}): Promise<TestServer> {
  // A database the caller prepared (e.g. migrated step by step), or a copy of the migrated template.
  const { url, drop } = opts.database ?? (await createTestDatabase());
  const { db, pool } = createDb(url, 5);
  let ids = { schemeId: '', secondSchemeId: '' };
  if (opts.seed !== false) ids = await seedDemo(db, { memberCount: 40 });
  const config = loadConfig({ ...process.env, NODE_ENV: 'test', DATABASE_URL: url, SESSION_SECRET: 'test-secret-0123456789abcdef', ...opts.env });
  // The app gets a pool of its own, so a restart can end it as a real process exit would.
  let appDb = createDb(url, 5);
  const listen = async (port: number) => {
    const server = http.createServer(createApp({ db: appDb.db, pool: appDb.pool, config }));
    await new Promise<void>((r) => server.listen(port, '127.0.0.1', r));
    return server;
  };
  let server = await listen(0);
  const port = (server.address() as AddressInfo).port;
  const stopServer = async () => {
    server.closeAllConnections();
    await new Promise((r) => server.close(r));
    await appDb.pool.end();
  };
  const links = linkSettings(config);
  return {
    url,
    baseUrl: `http://127.0.0.1:${port}`,
    db,
    ...ids,
    config,
    tokenFor: async (email, kind) => {
      const [t] = await db
        .select({ id: accessTokens.id })
        .from(accessTokens)
        .where(and(eq(accessTokens.email, email.toLowerCase()), eq(accessTokens.kind, kind), isNull(accessTokens.usedAt), isNull(accessTokens.revokedAt)))
        .orderBy(desc(accessTokens.createdAt))
        .limit(1);
      if (!t) throw new Error(`no live ${kind} link for ${email}`);
      return tokenFor(links, t.id);
    },
    restart: async () => {
      await stopServer();
      appDb = createDb(url, 5);
      server = await listen(port);
    },
    close: async () => {
      await stopServer();
      await pool.end();
      await drop();
    },
  };
}

/** A cookie-keeping HTTP client for the API, sending the same-site header on writes. */
export class Client {
  cookie = '';
  constructor(public baseUrl: string) {}
  async call(method: string, path: string, body?: unknown, headers: Record<string, string> = {}) {
    const h: Record<string, string> = { Accept: 'application/json', ...headers };
    if (method !== 'GET' && !('X-Keelson-Client' in headers)) h['X-Keelson-Client'] = '1';
    if (body !== undefined && !(body instanceof FormData)) h['Content-Type'] = 'application/json';
    if (this.cookie) h.Cookie = this.cookie;
    const send = () =>
      fetch(`${this.baseUrl}/api${path}`, {
        method,
        headers: h,
        body: body === undefined ? undefined : body instanceof FormData ? body : JSON.stringify(body),
        redirect: 'manual',
      });
    // A kept-alive socket to a server that has since restarted fails once; a new connection then succeeds.
    const res = await send().catch(send);
    const set = res.headers.getSetCookie();
    for (const c of set) {
      const [pair] = c.split(';');
      if (pair.startsWith('keelson.sid=')) this.cookie = pair;
    }
    const text = await res.text();
    let json: unknown = null;
    try {
      json = text ? JSON.parse(text) : null;
    } catch {
      json = text;
    }
    return { status: res.status, body: json as any, headers: res.headers };
  }
  get = (p: string) => this.call('GET', p);
  post = (p: string, b?: unknown) => this.call('POST', p, b ?? {});
  patch = (p: string, b?: unknown) => this.call('PATCH', p, b ?? {});
  put = (p: string, b?: unknown) => this.call('PUT', p, b ?? {});
  delete = (p: string) => this.call('DELETE', p);
  async signIn(email: string, password = 'keelson-demo-2026', headers: Record<string, string> = {}) {
    const r = await this.call('POST', '/auth/sign-in', { email, password }, headers);
    if (r.status !== 200) throw new Error(`sign-in as ${email} failed: ${r.status} ${JSON.stringify(r.body)}`);
    return r.body;
  }
}
