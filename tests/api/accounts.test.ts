import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, desc, eq, sql } from 'drizzle-orm';
import { accessTokens, auditEvents, outboxMessages, schemeRoles, sessions, users } from '../../db/schema';
import { CONFIRMATION_NEEDED, SIGN_IN_FAILED, ACCOUNT_FREE, ADDRESS_FREE } from '../../server/services/signIn';
import { LINK_REDACTED } from '../../server/auth/links';
import { Client, startTestServer, type TestServer } from '../helpers/app';
import { startMailbox } from './mailbox';

let s: TestServer;
let mail: Awaited<ReturnType<typeof startMailbox>>;
beforeAll(async () => {
  s = await startTestServer();
  mail = await startMailbox(s);
});
afterAll(async () => {
  await mail?.stop();
  await s?.close();
});

/** A client that comes from `ip` (the test server trusts X-Forwarded-For from loopback, as behind a local proxy). */
class From extends Client {
  constructor(
    baseUrl: string,
    private ip: string,
  ) {
    super(baseUrl);
  }
  call(method: string, path: string, body?: unknown, headers: Record<string, string> = {}) {
    return super.call(method, path, body, { 'X-Forwarded-For': this.ip, ...headers });
  }
}

const admin = () => {
  const c = new Client(s.baseUrl);
  return c.signIn('admin@fernleigh.example').then(() => c);
};
const GOOD = 'heron-lantern-quarry-57';

async function eventually<T>(what: string, f: () => Promise<T | null | undefined>, ms = 15_000): Promise<T> {
  const until = Date.now() + ms;
  for (;;) {
    const v = await f();
    if (v) return v;
    if (Date.now() > until) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

describe('sign-in', () => {
  it('signs in, lists only the schemes the user has a role on, and never returns the password hash', async () => {
    const c = new Client(s.baseUrl);
    const me = await c.signIn('actuary@fernleigh.example');
    expect(me.user.email).toBe('actuary@fernleigh.example');
    expect(me.schemes.map((x: { role: string }) => x.role)).toEqual(['actuary', 'actuary']);
    expect(JSON.stringify(me)).not.toMatch(/scrypt|passwordHash/);
  });

  it('issues a new session id at sign-in (no fixation)', async () => {
    const c = new Client(s.baseUrl);
    await c.signIn('board@fernleigh.example');
    const first = c.cookie;
    await c.signIn('board@fernleigh.example');
    expect(c.cookie).not.toBe(first);
  });

  it('gives the same answer for an unknown e-mail as for a wrong password', async () => {
    const unknown = await new From(s.baseUrl, '10.1.0.1').post('/auth/sign-in', { email: 'nobody-here@fernleigh.example', password: 'whatever-123' });
    const wrong = await new From(s.baseUrl, '10.1.0.2').post('/auth/sign-in', { email: 'comms@fernleigh.example', password: 'not-the-password' });
    expect([unknown.status, wrong.status]).toEqual([401, 401]);
    expect(unknown.body).toMatchObject({ error: wrong.body.error, message: SIGN_IN_FAILED });
  });

  it(`makes an address wait, progressively, after ${ADDRESS_FREE} failures — without even checking the password`, async () => {
    const attacker = new From(s.baseUrl, '10.2.0.9');
    for (let i = 0; i < ADDRESS_FREE; i++) {
      const r = await attacker.post('/auth/sign-in', { email: `victim-${i}@example.org`, password: `guess-${i}-password` });
      expect(r.status).toBe(401);
    }
    const early = await attacker.post('/auth/sign-in', { email: 'board@fernleigh.example', password: 'keelson-demo-2026' });
    expect(early.status).toBe(429);
    expect(Number(early.headers.get('retry-after'))).toBeGreaterThanOrEqual(1);
    // After the wait the next failure doubles it.
    await s.db.execute(sql`update sign_in_throttles set wait_until = now() - interval '1 second' where key = 'address:10.2.0.9'`);
    expect((await attacker.post('/auth/sign-in', { email: 'x@example.org', password: 'another-guess-1' })).status).toBe(401);
    const [row] = (await s.db.execute(sql`select failures, extract(epoch from wait_until - now()) as wait from sign_in_throttles where key = 'address:10.2.0.9'`)).rows as { failures: number; wait: number }[];
    expect(row.failures).toBe(ADDRESS_FREE + 1);
    expect(Number(row.wait)).toBeGreaterThan(1);
    // Another address is not held up.
    await new From(s.baseUrl, '10.2.0.10').signIn('board@fernleigh.example');
  });

  it('cannot be held against the right password: an attacker guessing from many addresses leaves the person a way in', async () => {
    const email = 'trustee@fernleigh.example';
    // The trustee's usual address, remembered at a successful sign-in.
    await new From(s.baseUrl, '192.0.2.10').signIn(email);
    // The attacker spreads guesses over addresses so no single address is delayed.
    for (let i = 0; i < 3 * ACCOUNT_FREE; i++) {
      const r = await new From(s.baseUrl, `198.51.100.${i + 1}`).post('/auth/sign-in', { email, password: `wrong-${i}-password` });
      expect([401, 202]).toContain(r.status);
    }
    // From the usual address: straight in.
    const known = await new From(s.baseUrl, '192.0.2.10').post('/auth/sign-in', { email, password: 'keelson-demo-2026' });
    expect(known.status).toBe(200);
    // Guard again, then from a new address: a right and a wrong password get the same answer ...
    for (let i = 0; i < ACCOUNT_FREE; i++) await new From(s.baseUrl, `198.51.101.${i + 1}`).post('/auth/sign-in', { email, password: `wrong-again-${i}` });
    const newPlace = new From(s.baseUrl, '203.0.113.7');
    const right = await newPlace.post('/auth/sign-in', { email, password: 'keelson-demo-2026' });
    const wrong = await new From(s.baseUrl, '203.0.113.8').post('/auth/sign-in', { email, password: 'not-it-at-all' });
    expect(right.status).toBe(202);
    expect(right.body).toEqual(wrong.body);
    expect(right.body.message).toBe(CONFIRMATION_NEEDED);
    expect((await newPlace.get('/auth/me')).status).toBe(401);
    // ... and only the right one e-mails the person a confirmation, which finishes the sign-in.
    const m = await mail.waitFor(email, /Confirm your Keelson sign-in/);
    const confirmed = await newPlace.post(`/auth/links/${mail.tokenIn(m).token}/confirm-sign-in`);
    expect(confirmed.status, JSON.stringify(confirmed.body)).toBe(200);
    expect((await newPlace.get('/auth/me')).body.user.email).toBe(email);
    expect(mail.delivered.filter((d) => d.to.includes(email) && /Confirm/.test(d.subject))).toHaveLength(1);
    // The confirmed address is now known: the next sign-in from it goes straight through.
    expect((await new From(s.baseUrl, '203.0.113.7').post('/auth/sign-in', { email, password: 'keelson-demo-2026' })).status).toBe(200);
  });

  it('guards unknown addresses the same way, so the guard does not reveal which addresses exist', async () => {
    const email = 'ghost@fernleigh.example';
    for (let i = 0; i < ACCOUNT_FREE; i++) await new From(s.baseUrl, `198.18.0.${i + 1}`).post('/auth/sign-in', { email, password: 'x-password-1' });
    const r = await new From(s.baseUrl, '198.18.1.1').post('/auth/sign-in', { email, password: 'x-password-2' });
    expect(r.status).toBe(202);
    expect(r.body.message).toBe(CONFIRMATION_NEEDED);
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

  it('end after their absolute lifetime, however active', async () => {
    const c = new Client(s.baseUrl);
    await c.signIn('comms@fernleigh.example');
    expect((await c.get('/auth/me')).status).toBe(200);
    const sid = decodeURIComponent(c.cookie.split('=')[1]).slice(2).split('.')[0];
    const old = Date.now() - (s.config.SESSION_ABSOLUTE_HOURS * 3600 + 60) * 1000;
    await s.db.execute(sql`update session set sess = jsonb_set(sess::jsonb, '{signedInAt}', to_jsonb(${old}::bigint))::json where sid = ${sid}`);
    expect((await c.get('/auth/me')).status).toBe(401);
    expect((await s.db.select().from(sessions).where(eq(sessions.sid, sid))).length).toBe(0);
  });

  it('other than the current one end when the password changes', async () => {
    const email = 'board@fernleigh.example';
    const phone = new Client(s.baseUrl);
    await phone.signIn(email);
    const laptop = new Client(s.baseUrl);
    await laptop.signIn(email);
    const r = await laptop.post('/auth/password', { currentPassword: 'keelson-demo-2026', newPassword: GOOD });
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    expect(r.body.otherSessionsEnded).toBeGreaterThanOrEqual(1);
    expect((await phone.get('/auth/me')).status).toBe(401);
    expect((await laptop.get('/auth/me')).status).toBe(200);
    await mail.waitFor(email, /password was changed/);
    await new Client(s.baseUrl).signIn(email, GOOD);
    await s.db.update(users).set({ passwordHash: (await s.db.select().from(users).where(eq(users.email, 'admin@fernleigh.example')))[0].passwordHash }).where(eq(users.email, email));
  });
});

describe('passwords', () => {
  it.each([
    ['too short', 'short-pw-1', /at least 12/],
    ['a common password', 'password1234', /too common/],
    ['the e-mail address', 'board@fernleigh.example', /e-mail/],
    ['a keyboard pattern', 'qwertyuiop123', /too common/],
  ])('refuses %s, naming the field', async (_label, pw, reason) => {
    const c = new Client(s.baseUrl);
    await c.signIn('board@fernleigh.example');
    const r = await c.post('/auth/password', { currentPassword: 'keelson-demo-2026', newPassword: pw });
    expect(r.status).toBe(400);
    expect(r.body.issues).toEqual([{ path: 'newPassword', message: expect.stringMatching(reason) }]);
  });

  it('changes a password only with the right current password', async () => {
    const c = new Client(s.baseUrl);
    await c.signIn('comms@fernleigh.example');
    const bad = await c.post('/auth/password', { currentPassword: 'nope', newPassword: GOOD });
    expect(bad.status).toBe(400);
    expect(bad.body.issues).toEqual([{ path: 'currentPassword', message: 'is not right' }]);
  });
});

describe('invitations', () => {
  it('e-mails the link through the outbox and never hands it to the inviter; the stored copy has no token', async () => {
    const c = await admin();
    const inv = await c.post(`/schemes/${s.schemeId}/invitations`, { email: 'New.Trustee@Example.org', role: 'trustee' });
    expect(inv.status).toBe(201);
    expect(inv.body).toMatchObject({ email: 'new.trustee@example.org', role: 'trustee', emailedTo: 'new.trustee@example.org' });
    expect(JSON.stringify(inv.body)).not.toMatch(/token|link|http/i);
    const m = await mail.waitFor('new.trustee@example.org', /invited/);
    const { url, token } = mail.tokenIn(m);
    expect(url.startsWith(`${s.config.PUBLIC_URL}/link?token=`)).toBe(true);
    const [stored] = await s.db.select().from(outboxMessages).where(eq(outboxMessages.kind, 'invitation')).orderBy(desc(outboxMessages.createdAt)).limit(1);
    expect(stored.body).not.toContain(token);
    const box = await c.get(`/schemes/${s.schemeId}/outbox`);
    const shown = box.body.messages.find((x: { id: string }) => x.id === stored.id);
    expect(shown.body).toContain(LINK_REDACTED);
    expect(JSON.stringify(box.body)).not.toContain(token);
    // The invited person creates an account with it, once.
    const anon = new Client(s.baseUrl);
    const info = await anon.get(`/auth/links/${token}`);
    expect(info.body).toMatchObject({ kind: 'invitation', email: 'new.trustee@example.org', role: 'trustee' });
    const weak = await anon.post(`/auth/links/${token}`, { password: 'short' });
    expect(weak.body.issues[0].path).toBe('password');
    expect((await anon.post(`/auth/links/${token}`, { password: GOOD, displayName: 'Nell Trustee' })).status).toBe(200);
    expect((await anon.post(`/auth/links/${token}`, { password: GOOD })).status).toBe(410);
    const me = await new Client(s.baseUrl).signIn('new.trustee@example.org', GOOD);
    expect(me.schemes).toEqual([expect.objectContaining({ id: s.schemeId, role: 'trustee' })]);
  });

  it("cannot take over an existing account of another scheme: redeeming never sets its password; the role comes once that person signs in and accepts", async () => {
    // The actuary of the second scheme is invited, by e-mail, by the first scheme's administrator.
    const [outsider] = await s.db.insert(users).values({ email: 'outsider@brackenfold.example', displayName: 'Ffion Outsider', passwordHash: (await s.db.select().from(users).where(eq(users.email, 'admin@fernleigh.example')))[0].passwordHash }).returning();
    await s.db.insert(schemeRoles).values({ userId: outsider.id, schemeId: s.secondSchemeId, role: 'actuary' });
    const c = await admin();
    const inv = await c.post(`/schemes/${s.schemeId}/invitations`, { email: 'outsider@brackenfold.example', role: 'administrator' });
    expect(inv.status).toBe(201);
    // Even holding the link (here: computed as the mail job would), a signed-out redeem sets nothing.
    const token = await s.tokenFor('outsider@brackenfold.example', 'invitation');
    const grab = await new Client(s.baseUrl).post(`/auth/links/${token}`, { password: 'attacker-chosen-password-9', displayName: 'Mallory' });
    expect(grab.status).toBe(409);
    expect(grab.body.error).toBe('account_exists');
    expect((await new Client(s.baseUrl).post('/auth/sign-in', { email: 'outsider@brackenfold.example', password: 'attacker-chosen-password-9' })).status).not.toBe(200);
    // Someone else signed in cannot accept it either.
    expect((await c.post(`/auth/links/${token}/accept`)).status).toBe(403);
    // The person signs in with their own password and accepts: the role is added, nothing else changes.
    const person = new Client(s.baseUrl);
    await person.signIn('outsider@brackenfold.example', 'keelson-demo-2026');
    const ok = await person.post(`/auth/links/${token}/accept`);
    expect(ok.status).toBe(200);
    const me = await person.get('/auth/me');
    expect(me.body.schemes.map((x: { id: string; role: string }) => [x.id, x.role]).sort()).toEqual([[s.schemeId, 'administrator'], [s.secondSchemeId, 'actuary']].sort());
    expect((await person.post(`/auth/links/${token}/accept`)).status).toBe(410);
  });

  it('keeps one waiting invitation per address, which can be sent again (new link, old one dead) or cancelled', async () => {
    const c = await admin();
    const first = await c.post(`/schemes/${s.schemeId}/invitations`, { email: 'twice@example.org', role: 'board' });
    expect(first.status).toBe(201);
    const oldToken = await s.tokenFor('twice@example.org', 'invitation');
    expect((await c.post(`/schemes/${s.schemeId}/invitations`, { email: 'TWICE@example.org', role: 'trustee' })).status).toBe(409);
    const again = await c.post(`/schemes/${s.schemeId}/invitations/${first.body.id}/resend`);
    expect(again.status).toBe(201);
    expect((await new Client(s.baseUrl).get(`/auth/links/${oldToken}`)).status).toBe(410);
    const newToken = await s.tokenFor('twice@example.org', 'invitation');
    expect((await new Client(s.baseUrl).get(`/auth/links/${newToken}`)).status).toBe(200);
    const list = await c.get(`/schemes/${s.schemeId}/people`);
    expect(list.body.pending.filter((p: { email: string }) => p.email === 'twice@example.org')).toHaveLength(1);
    expect((await c.delete(`/schemes/${s.schemeId}/invitations/${again.body.id}`)).status).toBe(200);
    expect((await new Client(s.baseUrl).get(`/auth/links/${newToken}`)).status).toBe(410);
    expect((await c.get(`/schemes/${s.schemeId}/people`)).body.pending.some((p: { email: string }) => p.email === 'twice@example.org')).toBe(false);
  });

  it('does not reveal, on looking up the link, whether the address has an account', async () => {
    const c = await admin();
    await c.post(`/schemes/${s.schemeId}/invitations`, { email: 'fresh-person@example.org', role: 'board' });
    await c.post(`/schemes/${s.secondSchemeId}/invitations`, { email: 'trustee@fernleigh.example', role: 'board' }).catch(() => null);
    const a = await new Client(s.baseUrl).get(`/auth/links/${await s.tokenFor('fresh-person@example.org', 'invitation')}`);
    expect(a.status).toBe(200);
    expect(Object.keys(a.body).sort()).toEqual(['email', 'expiresAt', 'kind', 'role', 'schemeName']);
  });

  it('refuses an expired link', async () => {
    const c = await admin();
    await c.post(`/schemes/${s.schemeId}/invitations`, { email: 'late@example.org', role: 'board' });
    const token = await s.tokenFor('late@example.org', 'invitation');
    await s.db.update(accessTokens).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(accessTokens.email, 'late@example.org'));
    expect((await new Client(s.baseUrl).get(`/auth/links/${token}`)).status).toBe(410);
    expect((await new Client(s.baseUrl).post(`/auth/links/${token}`, { password: GOOD })).status).toBe(410);
  });

  it('refuses an invitation for someone already on the scheme', async () => {
    const c = await admin();
    expect((await c.post(`/schemes/${s.schemeId}/invitations`, { email: 'TRUSTEE@fernleigh.example', role: 'board' })).status).toBe(409);
  });
});

describe('password resets', () => {
  it('builds the link from PUBLIC_URL, whatever Host header the request carried', async () => {
    const r = await new Client(s.baseUrl).call('POST', '/auth/forgot-password', { email: 'actuary@fernleigh.example' }, { Host: 'attacker.example' });
    expect(r.status).toBe(200);
    const m = await mail.waitFor('actuary@fernleigh.example', /Reset your Keelson password/);
    const { url } = mail.tokenIn(m);
    expect(new URL(url).host).toBe(new URL(s.config.PUBLIC_URL).host);
    expect(m.text).not.toContain('attacker.example');
  });

  it('answers the same for unknown addresses, keeps one live link per person, and limits requests per address', async () => {
    const limited = await startTestServer({ env: { FORGOT_PASSWORD_RATE_LIMIT: '3' } });
    try {
      const a = await new Client(limited.baseUrl).post('/auth/forgot-password', { email: 'board@fernleigh.example' });
      const b = await new Client(limited.baseUrl).post('/auth/forgot-password', { email: 'nobody@fernleigh.example' });
      expect(a.status).toBe(200);
      expect(a.body).toEqual(b.body);
      await eventually('the first reset link', async () => (await limited.db.select().from(accessTokens).where(eq(accessTokens.email, 'board@fernleigh.example'))).length === 1);
      // A second request within a minute sends nothing more (no mail-bombing one person) ...
      expect((await new Client(limited.baseUrl).post('/auth/forgot-password', { email: 'board@fernleigh.example' })).status).toBe(200);
      await new Promise((r) => setTimeout(r, 1500));
      expect((await limited.db.select().from(accessTokens).where(eq(accessTokens.email, 'board@fernleigh.example'))).length).toBe(1);
      // ... and the fourth request from this address is refused.
      expect((await new Client(limited.baseUrl).post('/auth/forgot-password', { email: 'board@fernleigh.example' })).status).toBe(429);
      // A later request (another address) issues a new link, and the earlier one stops working.
      await limited.db.update(accessTokens).set({ createdAt: new Date(Date.now() - 120_000) }).where(eq(accessTokens.email, 'board@fernleigh.example'));
      const other = new Client(limited.baseUrl);
      expect((await other.call('POST', '/auth/forgot-password', { email: 'board@fernleigh.example' }, { 'X-Forwarded-For': '192.0.2.77' })).status).toBe(200);
      const live = await eventually('two reset links issued', async () => {
        const rows = await limited.db.select().from(accessTokens).where(and(eq(accessTokens.email, 'board@fernleigh.example'), eq(accessTokens.kind, 'password_reset')));
        return rows.length === 2 ? rows : null;
      });
      expect(live.filter((t) => !t.revokedAt && !t.usedAt)).toHaveLength(1);
      expect((await limited.db.select().from(accessTokens).where(eq(accessTokens.email, 'nobody@fernleigh.example'))).length).toBe(0);
    } finally {
      await limited.close();
    }
  });

  it("from an administrator go to the person (never back to the administrator), tell them, and end the person's sessions", async () => {
    const c = await admin();
    const comms = new Client(s.baseUrl);
    await comms.signIn('comms@fernleigh.example');
    const people = await c.get(`/schemes/${s.schemeId}/people`);
    const person = people.body.people.find((p: { email: string }) => p.email === 'comms@fernleigh.example');
    const r = await c.post(`/schemes/${s.schemeId}/people/${person.id}/reset-link`);
    expect(r.status).toBe(202);
    expect(r.body).toMatchObject({ emailedTo: 'comms@fernleigh.example' });
    expect(JSON.stringify(r.body)).not.toMatch(/token|http/);
    expect((await comms.get('/auth/me')).status).toBe(401);
    const m = await mail.waitFor('comms@fernleigh.example', /administrator sent you a password reset/);
    expect(m.text).toContain('Morag Tennant');
    const { token } = mail.tokenIn(m);
    expect((await new Client(s.baseUrl).post(`/auth/links/${token}`, { password: GOOD })).status).toBe(200);
    await new Client(s.baseUrl).signIn('comms@fernleigh.example', GOOD);
    expect((await new Client(s.baseUrl).post('/auth/sign-in', { email: 'comms@fernleigh.example', password: 'keelson-demo-2026' })).status).toBe(401);
  });

  it("shows account mail only to the person's current schemes", async () => {
    const c = await admin();
    const [u] = await s.db.insert(users).values({ email: 'leaver@example.org', displayName: 'Leaver', passwordHash: 'x' }).returning();
    await s.db.insert(schemeRoles).values({ userId: u.id, schemeId: s.schemeId, role: 'board' });
    await c.post(`/schemes/${s.schemeId}/people/${u.id}/reset-link`);
    const subject = 'Your Keelson administrator sent you a password reset';
    const seen = async () => (await c.get(`/schemes/${s.schemeId}/outbox`)).body.messages.some((m: { recipients: string[]; subject: string }) => m.recipients.includes('leaver@example.org') && m.subject === subject);
    expect(await seen()).toBe(true);
    expect((await c.delete(`/schemes/${s.schemeId}/people/${u.id}`)).status).toBe(200);
    expect(await seen()).toBe(false);
  });
});

describe('people and the audit trail', () => {
  it('records a role change with before and after values, readable by the administrator', async () => {
    const c = await admin();
    const [u] = await s.db.insert(users).values({ email: 'role-change@example.org', displayName: 'Role Change', passwordHash: 'x' }).returning();
    await s.db.insert(schemeRoles).values({ userId: u.id, schemeId: s.schemeId, role: 'board' });
    expect((await c.patch(`/schemes/${s.schemeId}/people/${u.id}`, { role: 'trustee' })).status).toBe(200);
    const log = await c.get(`/schemes/${s.schemeId}/activity`);
    const ev = log.body.events.find((e: { action: string }) => e.action === 'role.changed');
    expect(ev).toMatchObject({ actorEmail: 'admin@fernleigh.example', entityId: u.id, before: { role: 'board' }, after: { role: 'trustee' } });
    expect(log.body.events.some((e: { action: string }) => e.action === 'sign-in')).toBe(true);
  });

  it('does not let an administrator change or remove their own role', async () => {
    const c = await admin();
    const me = await c.get('/auth/me');
    expect((await c.patch(`/schemes/${s.schemeId}/people/${me.body.user.id}`, { role: 'board' })).status).toBe(409);
    expect((await c.delete(`/schemes/${s.schemeId}/people/${me.body.user.id}`)).status).toBe(409);
  });

  it('never writes a password or token into the audit trail or the outbox', async () => {
    const rows = await s.db.select().from(auditEvents);
    expect(JSON.stringify(rows)).not.toMatch(new RegExp(`${GOOD}|keelson-demo-2026|scrypt\\$`));
    const box = await s.db.select().from(outboxMessages);
    for (const m of mail.delivered) {
      const t = /token=([A-Za-z0-9_-]+)/.exec(m.text)?.[1];
      if (t) expect(JSON.stringify(box)).not.toContain(t);
    }
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
