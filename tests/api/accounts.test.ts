import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, desc, eq, sql } from 'drizzle-orm';
import { accessTokens, auditEvents, sessions } from '../../db/schema';
import { LOCK_MINUTES, MAX_FAILURES, SIGN_IN_FAILED } from '../../server/services/accounts';
import { Client, startTestServer, type TestServer } from '../helpers/app';

let s: TestServer;
beforeAll(async () => {
  s = await startTestServer();
});
afterAll(async () => s?.close());

const admin = () => {
  const c = new Client(s.baseUrl);
  return c.signIn('admin@fernleigh.example').then(() => c);
};

describe('sign-in', () => {
  it('signs in, lists only the schemes the user has a role on, and never returns the password hash', async () => {
    const c = new Client(s.baseUrl);
    const me = await c.signIn('actuary@fernleigh.example');
    expect(me.user.email).toBe('actuary@fernleigh.example');
    expect(me.schemes.map((x: { role: string }) => x.role)).toEqual(['actuary', 'actuary']);
    expect(JSON.stringify(me)).not.toMatch(/scrypt|passwordHash/);
    const trustee = new Client(s.baseUrl);
    const tme = await trustee.signIn('trustee@fernleigh.example');
    expect(tme.schemes).toHaveLength(1);
  });

  it('issues a new session id at sign-in (no fixation)', async () => {
    const c = new Client(s.baseUrl);
    await c.signIn('board@fernleigh.example');
    const first = c.cookie;
    await c.signIn('board@fernleigh.example');
    expect(c.cookie).not.toBe(first);
  });

  it('gives the same answer for an unknown e-mail as for a wrong password', async () => {
    const unknown = await new Client(s.baseUrl).post('/auth/sign-in', { email: 'nobody-here@fernleigh.example', password: 'whatever-123' });
    const wrong = await new Client(s.baseUrl).post('/auth/sign-in', { email: 'comms@fernleigh.example', password: 'not-the-password' });
    expect(unknown.status).toBe(401);
    expect(wrong.status).toBe(401);
    expect(unknown.body.message).toBe(wrong.body.message);
    expect(unknown.body.error).toBe(wrong.body.error);
    expect(unknown.body.message).toBe(SIGN_IN_FAILED);
  });

  it(`locks an address after ${MAX_FAILURES} failures, even for the right password, and records each failure`, async () => {
    const email = 'trustee@fernleigh.example';
    for (let i = 0; i < MAX_FAILURES; i++) {
      const r = await new Client(s.baseUrl).post('/auth/sign-in', { email, password: `wrong-${i}-password` });
      expect(r.status).toBe(401);
    }
    const locked = await new Client(s.baseUrl).post('/auth/sign-in', { email, password: 'keelson-demo-2026' });
    expect(locked.status).toBe(401);
    expect(locked.body.message).toBe(SIGN_IN_FAILED);
    const failures = await s.db.select().from(auditEvents).where(and(eq(auditEvents.action, 'sign-in.failed'), eq(auditEvents.actorEmail, email)));
    expect(failures.length).toBeGreaterThanOrEqual(MAX_FAILURES + 1);
    // When the lock runs out the right password works again.
    await s.db.execute(sql`update sign_in_failures set locked_until = now() - interval '1 minute' where email_key = ${email}`);
    const after = await new Client(s.baseUrl).post('/auth/sign-in', { email, password: 'keelson-demo-2026' });
    expect(after.status, `lock lasts ${LOCK_MINUTES} minutes`).toBe(200);
  });

  it('locks unknown addresses the same way, so lock-out does not reveal which addresses exist', async () => {
    const email = 'ghost@fernleigh.example';
    for (let i = 0; i < MAX_FAILURES; i++) await new Client(s.baseUrl).post('/auth/sign-in', { email, password: 'x-password-1' });
    const [row] = (await s.db.execute(sql`select locked_until from sign_in_failures where email_key = ${email}`)).rows as { locked_until: Date | null }[];
    expect(row.locked_until).not.toBeNull();
  });

  it('rate-limits sign-in attempts from one address with 429', async () => {
    const limited = await startTestServer({ seed: false, env: { SIGN_IN_RATE_LIMIT: '3' } });
    try {
      const codes: number[] = [];
      for (let i = 0; i < 4; i++) codes.push((await new Client(limited.baseUrl).post('/auth/sign-in', { email: `a${i}@b.example`, password: 'zzzzzzzzzz' })).status);
      expect(codes).toEqual([401, 401, 401, 429]);
    } finally {
      await limited.close();
    }
  });
});

describe('sessions', () => {
  it('survive a server restart, because they live in PostgreSQL', async () => {
    const c = new Client(s.baseUrl);
    await c.signIn('comms@fernleigh.example');
    await s.restart();
    const me = await c.get('/auth/me');
    expect(me.status).toBe(200);
    expect(me.body.user.email).toBe('comms@fernleigh.example');
  });

  it('end at sign-out on the server: the old cookie no longer works', async () => {
    const c = new Client(s.baseUrl);
    await c.signIn('board@fernleigh.example');
    const sid = decodeURIComponent(c.cookie.split('=')[1]).slice(2).split('.')[0];
    expect((await s.db.select().from(sessions).where(eq(sessions.sid, sid))).length).toBe(1);
    const oldCookie = c.cookie;
    expect((await c.post('/auth/sign-out')).status).toBe(200);
    expect((await s.db.select().from(sessions).where(eq(sessions.sid, sid))).length).toBe(0);
    const replay = new Client(s.baseUrl);
    replay.cookie = oldCookie;
    expect((await replay.get('/auth/me')).status).toBe(401);
  });

  it('set an httpOnly, SameSite cookie with an idle timeout', async () => {
    const res = await fetch(`${s.baseUrl}/api/auth/sign-in`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json', 'X-Keelson-Client': '1' },
      body: JSON.stringify({ email: 'board@fernleigh.example', password: 'keelson-demo-2026' }),
    });
    const cookie = res.headers.getSetCookie().find((c) => c.startsWith('keelson.sid='))!;
    expect(cookie).toMatch(/HttpOnly/);
    expect(cookie).toMatch(/SameSite=Lax/);
    expect(cookie).toMatch(/Expires=/);
    expect(cookie).not.toMatch(/Secure/);
  });
});

describe('cross-site write protection', () => {
  it('refuses a write without the client header, and one from a foreign Origin', async () => {
    const c = await admin();
    const noHeader = await c.call('POST', `/schemes/${s.schemeId}/invitations`, { email: 'x1@example.org', role: 'board' }, { 'X-Keelson-Client': '' });
    expect(noHeader.status).toBe(403);
    const foreign = await c.call('POST', `/schemes/${s.schemeId}/invitations`, { email: 'x2@example.org', role: 'board' }, { Origin: 'https://elsewhere.example' });
    expect(foreign.status).toBe(403);
    const pending = await s.db.select().from(accessTokens).where(sql`${accessTokens.email} in ('x1@example.org','x2@example.org')`);
    expect(pending).toEqual([]);
  });
});

describe('invitations and password resets', () => {
  it('lets an invited person set a password once, grants the role, and records it', async () => {
    const c = await admin();
    const inv = await c.post(`/schemes/${s.schemeId}/invitations`, { email: 'New.Trustee@Example.org', role: 'trustee' });
    expect(inv.status).toBe(201);
    const token = new URL(inv.body.link).searchParams.get('token')!;
    const anon = new Client(s.baseUrl);
    const info = await anon.get(`/auth/links/${token}`);
    expect(info.body).toMatchObject({ kind: 'invitation', email: 'new.trustee@example.org', role: 'trustee', newAccount: true });
    const short = await anon.post(`/auth/links/${token}`, { password: 'short' });
    expect(short.status).toBe(400);
    expect(short.body.issues[0].path).toBe('password');
    const ok = await anon.post(`/auth/links/${token}`, { password: 'a-good-long-password', displayName: 'Nell Trustee' });
    expect(ok.status).toBe(200);
    const again = await anon.post(`/auth/links/${token}`, { password: 'another-long-password' });
    expect(again.status).toBe(410);
    const me = await new Client(s.baseUrl).signIn('new.trustee@example.org', 'a-good-long-password');
    expect(me.schemes).toEqual([expect.objectContaining({ id: s.schemeId, role: 'trustee' })]);
    const [ev] = await s.db.select().from(auditEvents).where(eq(auditEvents.action, 'invitation.accepted'));
    expect(ev.after).toEqual({ role: 'trustee' });
  });

  it('refuses an expired link', async () => {
    const c = await admin();
    const inv = await c.post(`/schemes/${s.schemeId}/invitations`, { email: 'late@example.org', role: 'board' });
    const token = new URL(inv.body.link).searchParams.get('token')!;
    await s.db.update(accessTokens).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(accessTokens.email, 'late@example.org'));
    expect((await new Client(s.baseUrl).get(`/auth/links/${token}`)).status).toBe(410);
    expect((await new Client(s.baseUrl).post(`/auth/links/${token}`, { password: 'a-good-long-password' })).status).toBe(410);
  });

  it('resets a password through an administrator-issued link', async () => {
    const c = await admin();
    const people = await c.get(`/schemes/${s.schemeId}/people`);
    const comms = people.body.people.find((p: { email: string }) => p.email === 'comms@fernleigh.example');
    const link = await c.post(`/schemes/${s.schemeId}/people/${comms.id}/reset-link`);
    const token = new URL(link.body.link).searchParams.get('token')!;
    expect((await new Client(s.baseUrl).post(`/auth/links/${token}`, { password: 'comms-new-password-1' })).status).toBe(200);
    await new Client(s.baseUrl).signIn('comms@fernleigh.example', 'comms-new-password-1');
    const old = await new Client(s.baseUrl).post('/auth/sign-in', { email: 'comms@fernleigh.example', password: 'keelson-demo-2026' });
    expect(old.status).toBe(401);
  });

  it('answers forgot-password the same whether or not the address exists', async () => {
    const a = await new Client(s.baseUrl).post('/auth/forgot-password', { email: 'board@fernleigh.example' });
    const b = await new Client(s.baseUrl).post('/auth/forgot-password', { email: 'nobody@fernleigh.example' });
    expect(a.status).toBe(200);
    expect(a.body).toEqual(b.body);
  });

  it('changes a password only with the right current password', async () => {
    const c = new Client(s.baseUrl);
    await c.signIn('board@fernleigh.example');
    const bad = await c.post('/auth/password', { currentPassword: 'nope', newPassword: 'board-new-password' });
    expect(bad.status).toBe(400);
    expect(bad.body.issues).toEqual([{ path: 'currentPassword', message: 'is not right' }]);
    expect((await c.post('/auth/password', { currentPassword: 'keelson-demo-2026', newPassword: 'board-new-password' })).status).toBe(200);
    await new Client(s.baseUrl).signIn('board@fernleigh.example', 'board-new-password');
  });
});

describe('people and the audit trail', () => {
  it('records a role change with before and after values, readable by the administrator', async () => {
    const c = await admin();
    const inv = await c.post(`/schemes/${s.schemeId}/invitations`, { email: 'role-change@example.org', role: 'board' });
    const token = new URL(inv.body.link).searchParams.get('token')!;
    await new Client(s.baseUrl).post(`/auth/links/${token}`, { password: 'a-good-long-password' });
    const people = await c.get(`/schemes/${s.schemeId}/people`);
    const p = people.body.people.find((x: { email: string }) => x.email === 'role-change@example.org');
    expect((await c.patch(`/schemes/${s.schemeId}/people/${p.id}`, { role: 'trustee' })).status).toBe(200);
    const log = await c.get(`/schemes/${s.schemeId}/activity`);
    const ev = log.body.events.find((e: { action: string }) => e.action === 'role.changed');
    expect(ev).toMatchObject({ actorEmail: 'admin@fernleigh.example', entityId: p.id, before: { role: 'board' }, after: { role: 'trustee' } });
    expect(log.body.events.some((e: { action: string }) => e.action === 'sign-in')).toBe(true);
  });

  it('does not let an administrator change or remove their own role', async () => {
    const c = await admin();
    const me = await c.get('/auth/me');
    expect((await c.patch(`/schemes/${s.schemeId}/people/${me.body.user.id}`, { role: 'board' })).status).toBe(409);
    expect((await c.delete(`/schemes/${s.schemeId}/people/${me.body.user.id}`)).status).toBe(409);
  });

  it('refuses an invitation for someone already on the scheme', async () => {
    const c = await admin();
    const r = await c.post(`/schemes/${s.schemeId}/invitations`, { email: 'TRUSTEE@fernleigh.example', role: 'board' });
    expect(r.status).toBe(409);
  });

  it('never writes a password or token into the audit trail', async () => {
    const rows = await s.db.select().from(auditEvents).orderBy(desc(auditEvents.id));
    expect(JSON.stringify(rows)).not.toMatch(/a-good-long-password|keelson-demo-2026|scrypt\$/);
  });
});
