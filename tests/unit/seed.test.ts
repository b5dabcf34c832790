import { describe, expect, it } from 'vitest';
import { DEMO_PASSWORD, DEMO_PASSWORD_HASH } from '../../db/seed';
import { verifyPassword } from '../../server/auth/password';

describe('the demo seed', () => {
  it('stores a demo password hash the server accepts', async () => {
    expect(await verifyPassword(DEMO_PASSWORD, DEMO_PASSWORD_HASH)).toBe(true);
    expect(await verifyPassword('not-the-demo-password', DEMO_PASSWORD_HASH)).toBe(false);
  });
});
