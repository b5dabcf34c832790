import { execFile, spawn, type ChildProcess } from 'node:child_process';
import { chmodSync, mkdtempSync, rmSync } from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';

const run = promisify(execFile);
export const ROOT = path.resolve(__dirname, '../..');

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.once('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const port = (srv.address() as net.AddressInfo).port;
      srv.close(() => resolve(port));
    });
  });
}

/**
 * A private, throwaway PostgreSQL cluster of this test's own (scripts/db.sh with its own
 * folder and port), so the test can really stop and start the database server.
 */
export async function throwawayCluster() {
  const dir = mkdtempSync(path.join(process.env.TMPDIR ?? os.tmpdir(), 'keelson-pg-'));
  // PostgreSQL runs as the postgres user when we are root: it must be able to reach the folder.
  chmodSync(dir, 0o755);
  const port = await freePort();
  const env = { ...process.env, KEELSON_PG_DIR: path.join(dir, 'data'), KEELSON_PG_PORT: String(port), KEELSON_DB_NAME: 'keelson', KEELSON_PG_FSYNC: 'off' };
  const db = (cmd: 'start' | 'stop') => run('bash', [path.join(ROOT, 'scripts/db.sh'), cmd], { env, cwd: ROOT });
  await db('start');
  return {
    url: `postgres://keelson@127.0.0.1:${port}/keelson`,
    start: () => db('start'),
    stop: () => db('stop'),
    destroy: async () => {
      await db('stop').catch(() => undefined);
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** Starts a Keelson process (server or worker) from its TypeScript entry; its output is kept. */
export function startProcess(entry: string, env: Record<string, string>): ChildProcess & { output: () => string } {
  // One process (no tsx launcher in between), so signals reach it directly.
  const child = spawn(process.execPath, ['--require', 'tsx/cjs', path.join(ROOT, entry)], {
    cwd: ROOT,
    env: { ...process.env, NODE_ENV: 'test', KEELSON_LOG_LEVEL: 'info', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  child.stdout!.on('data', (d) => (out += d));
  child.stderr!.on('data', (d) => (out += d));
  return Object.assign(child, { output: () => out });
}

export const alive = (c: ChildProcess) => c.exitCode === null && c.signalCode === null;

/** Polls `f` until it returns a value, or fails after `ms` naming `what`. */
export async function until<T>(what: string, f: () => Promise<T | null | undefined | false>, ms = 30_000, every = 200): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = await f().catch(() => null);
    if (v) return v;
    if (Date.now() > end) throw new Error(`timed out after ${ms} ms waiting for ${what}`);
    await new Promise((r) => setTimeout(r, every));
  }
}
