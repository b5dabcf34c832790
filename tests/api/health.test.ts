import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client, startTestServer, type TestServer } from '../helpers/app';

let s: TestServer;
beforeAll(async () => {
  s = await startTestServer({ seed: false });
});
afterAll(async () => s?.close());

describe('GET /api/health', () => {
  it('reports the database as connected', async () => {
    const r = await new Client(s.baseUrl).get('/health');
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({ status: 'ok', database: 'connected' });
  });

  it('answers an unknown API route with a JSON 404 and a request id', async () => {
    const r = await new Client(s.baseUrl).get('/no-such-thing');
    expect(r.status).toBe(404);
    expect(r.body.requestId).toMatch(/^[0-9a-f-]{36}$/);
    expect(r.headers.get('x-request-id')).toBe(r.body.requestId);
  });

  it('rejects malformed JSON with a 400, not a 500', async () => {
    const res = await fetch(`${s.baseUrl}/api/auth/sign-in`, { method: 'POST', headers: { 'Content-Type': 'application/json', 'X-Keelson-Client': '1' }, body: '{"email": ' });
    expect(res.status).toBe(400);
    expect((await res.json()).message).toMatch(/not valid JSON/);
  });

  it('refuses a body over the size limit with 413', async () => {
    const res = await fetch(`${s.baseUrl}/api/auth/sign-in`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json', 'X-Keelson-Client': '1' },
      body: JSON.stringify({ email: 'a@b.c', password: 'x'.repeat(2_000_000) }),
    });
    expect(res.status).toBe(413);
  });

  it('sends security headers', async () => {
    const res = await fetch(`${s.baseUrl}/api/health`);
    expect(res.headers.get('x-content-type-options')).toBe('nosniff');
    expect(res.headers.get('content-security-policy')).toContain("default-src 'self'");
  });
});
