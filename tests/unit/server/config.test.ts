import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadConfig } from '../../../server/config';
import { can, PERMISSIONS, ROLES } from '../../../constants/permissions';

describe('configuration', () => {
  it('applies defaults for a bare environment', () => {
    const c = loadConfig({});
    expect(c.PORT).toBe(8080);
    expect(c.HOST).toBe('127.0.0.1');
    expect(c.COOKIE_SECURE).toBe(false);
    expect(c.SESSION_SECRET.length).toBeGreaterThanOrEqual(16);
  });

  it('names every invalid variable and why', () => {
    expect(() => loadConfig({ PORT: 'eighty', DATABASE_URL: 'mysql://x', SESSION_SECRET: 'short' })).toThrow(
      /PORT: .*\n.*DATABASE_URL: must be a postgres:\/\/ URL\n.*SESSION_SECRET: must be at least 16 characters/s,
    );
  });
});

describe('production settings', () => {
  it('refuses to start in production without SESSION_SECRET, PUBLIC_URL and secure cookies, naming each', () => {
    expect(() => loadConfig({ NODE_ENV: 'production' })).toThrow(/SESSION_SECRET: is required in production[\s\S]*PUBLIC_URL: is required in production[\s\S]*COOKIE_SECURE: must be true in production/);
    expect(() => loadConfig({ NODE_ENV: 'production', SESSION_SECRET: 'x'.repeat(32), PUBLIC_URL: 'https://keelson.example.org' })).toThrow(/COOKIE_SECURE/);
    const ok = loadConfig({ NODE_ENV: 'production', SESSION_SECRET: 'x'.repeat(32), PUBLIC_URL: 'https://keelson.example.org/', COOKIE_SECURE: 'true' });
    expect(ok.PUBLIC_URL).toBe('https://keelson.example.org');
  });

  it('makes the server and the worker process exit with the reasons instead of starting', { timeout: 60_000 }, () => {
    const root = path.resolve(__dirname, '../../..');
    for (const entry of ['server/index.ts', 'server/jobs/worker.ts']) {
      const r = spawnSync(process.execPath, ['--require', 'tsx/cjs', entry], { cwd: root, env: { PATH: process.env.PATH, NODE_ENV: 'production', PORT: '0' }, encoding: 'utf8', timeout: 30_000 });
      expect(r.status, `${entry}: ${r.stderr}`).toBe(2);
      expect(r.stderr).toMatch(/SESSION_SECRET/);
      expect(r.stderr).toMatch(/PUBLIC_URL/);
      expect(r.stderr).toMatch(/COOKIE_SECURE/);
    }
  });

  it('builds links from PUBLIC_URL, defaulting in development to the configured host and port', () => {
    expect(loadConfig({ HOST: '0.0.0.0', PORT: '9090' }).PUBLIC_URL).toBe('http://localhost:9090');
    expect(loadConfig({ PUBLIC_URL: 'https://k.example.org/' }).PUBLIC_URL).toBe('https://k.example.org');
  });

  it('reads TRUST_PROXY as Express does', () => {
    expect(loadConfig({}).TRUST_PROXY).toBe('loopback');
    expect(loadConfig({ TRUST_PROXY: 'false' }).TRUST_PROXY).toBe(false);
    expect(loadConfig({ TRUST_PROXY: '2' }).TRUST_PROXY).toBe(2);
  });
});

describe('permission table', () => {
  it('gives every permission to at least one role and only to known roles', () => {
    for (const [perm, roles] of Object.entries(PERMISSIONS)) {
      expect(roles.length, perm).toBeGreaterThan(0);
      for (const r of roles) expect(ROLES).toContain(r);
    }
  });

  it('keeps the board reviewer read-only', () => {
    const writes = Object.keys(PERMISSIONS).filter((p) => !p.endsWith(':read')) as (keyof typeof PERMISSIONS)[];
    expect(writes.filter((p) => can('board', p))).toEqual([]);
  });

  it('denies everything to someone with no role', () => {
    expect(can(null, 'scheme:read')).toBe(false);
  });
});
