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
