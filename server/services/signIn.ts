import { isIPv6 } from 'node:net';
import { and, eq, inArray, sql } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { signInAddresses, signInThrottles, users } from '../../db/schema';
import { dummyPasswordHash, verifyPassword } from '../auth/password';
import type { AppContext } from '../context';
import { linkSettings, LINK_PLACEHOLDER } from '../auth/links';
import { sendMail } from '../email/outbox';
import { audit } from './audit';
import type { ServiceContext } from './context';
import { CONFIRMATION_MINUTES, emailKey, issueLink } from './tokens';

/**
 * Sign-in throttling without lock-out (OWASP ASVS 2.2.1).
 *
 * - Per client address: after ADDRESS_FREE failures in a row, each further attempt from that
 *   address must wait 1 s, 2 s, 4 s … up to MAX_ADDRESS_DELAY_S; an attempt made too early is
 *   answered 429 with Retry-After and is not even checked.
 * - Per account (known address or not, so nothing tells which accounts exist): after
 *   ACCOUNT_FREE failures the account is guarded for 1, 2, 4 … minutes (up to a day), growing
 *   with each further failure. While guarded, the right password from an address the person
 *   has signed in from before still signs in at once; from a new address it does not sign in
 *   directly but e-mails the person a one-use confirmation link that finishes the sign-in.
 *   A wrong password from a new address gets the very same answer, so the guard is no oracle.
 *
 * An attacker can therefore slow their own address down and make new-address sign-ins need
 * the mailbox, but never keep the person out: the right password always works, directly or
 * through the e-mailed link.
 */
export const ADDRESS_FREE = 10;
export const MAX_ADDRESS_DELAY_S = 15 * 60;
export const ACCOUNT_FREE = 5;
export const MAX_ACCOUNT_GUARD_MIN = 24 * 60;
/** Failures further apart than this start the count again. */
const FORGET_AFTER_HOURS = 24;

/** The one answer for any failed sign-in: unknown address or wrong password alike. */
export const SIGN_IN_FAILED = 'That e-mail address and password do not match an account. Check them and try again, or reset your password.';
export const CONFIRMATION_NEEDED = `After several failed sign-ins to this account, signing in from a new place needs confirming by e-mail. If the e-mail address and password were right, a confirmation link is on its way to that address: open it within ${CONFIRMATION_MINUTES} minutes to finish signing in.`;

export type SignInResult =
  | { kind: 'ok'; user: { id: string; email: string; displayName: string } }
  | { kind: 'failed' }
  | { kind: 'confirm' }
  | { kind: 'wait'; retryAfterSeconds: number };

/** The address a throttle and the known-address list use: IPv4 as is, IPv6 by its /64 (privacy addresses change within it). */
export function addressKey(ip: string | null | undefined): string {
  const a = (ip ?? 'unknown').replace(/^::ffff:(\d+\.\d+\.\d+\.\d+)$/, '$1');
  if (!isIPv6(a)) return a.slice(0, 64);
  const full = a.includes('::') ? expandV6(a) : a.split(':');
  return `${full.slice(0, 4).join(':')}::/64`;
}
function expandV6(a: string): string[] {
  const [head, tail] = a.split('::');
  const h = head ? head.split(':') : [];
  const t = tail ? tail.split(':') : [];
  return [...h, ...Array(8 - h.length - t.length).fill('0'), ...t];
}

const accountKey = (email: string) => `account:${emailKey(email)}`.slice(0, 300);
const addrKey = (addr: string) => `address:${addr}`;

/** Delay rule: nothing for the first `free` failures, then doubling from one unit, capped. */
export function delayAfter(failures: number, free: number, cap: number): number {
  return failures < free ? 0 : Math.min(cap, 2 ** (failures - free));
}

/** Counts one failure against `key` and sets how long it must wait (seconds) or stay guarded. */
async function recordFailure(db: Db, key: string, free: number, cap: number, unitSeconds: number) {
  const res = await db.execute(sql`
    insert into sign_in_throttles as t (key, failures, last_failure_at) values (${key}, 1, now())
    on conflict (key) do update set
      failures = case when t.last_failure_at < now() - make_interval(hours => ${FORGET_AFTER_HOURS}) then 1 else t.failures + 1 end,
      last_failure_at = now()
    returning failures`);
  const failures = Number((res.rows[0] as { failures: number }).failures);
  const seconds = delayAfter(failures, free, cap) * unitSeconds;
  await db
    .update(signInThrottles)
    .set({ waitUntil: seconds > 0 ? sql`now() + make_interval(secs => ${seconds})` : null })
    .where(eq(signInThrottles.key, key));
}

export async function checkSignIn(app: AppContext, sc: ServiceContext, email: string, password: string): Promise<SignInResult> {
  const key = emailKey(email);
  const addr = addressKey(sc.ip);
  const rows = await app.db
    .select({ key: signInThrottles.key, waitUntil: signInThrottles.waitUntil })
    .from(signInThrottles)
    .where(inArray(signInThrottles.key, [accountKey(key), addrKey(addr)]));
  const now = Date.now();
  const waitOf = (k: string) => {
    const w = rows.find((r) => r.key === k)?.waitUntil;
    return w && w.getTime() > now ? w.getTime() - now : 0;
  };
  const addressWait = waitOf(addrKey(addr));
  if (addressWait > 0) return { kind: 'wait', retryAfterSeconds: Math.ceil(addressWait / 1000) };
  const guarded = waitOf(accountKey(key)) > 0;

  const [user] = await app.db.select().from(users).where(sql`lower(${users.email}) = ${key}`);
  // Unknown addresses cost one scrypt check too, so timing does not tell them apart.
  const ok = await verifyPassword(password, user?.passwordHash ?? (await dummyPasswordHash()));
  const known = user
    ? (await app.db.select({ a: signInAddresses.address }).from(signInAddresses).where(and(eq(signInAddresses.userId, user.id), eq(signInAddresses.address, addr)))).length > 0
    : false;

  if (ok && user?.passwordHash) {
    if (!guarded || known) {
      await app.db.delete(signInThrottles).where(eq(signInThrottles.key, accountKey(key)));
      await rememberAddress(app.db, user.id, addr);
      return { kind: 'ok', user: { id: user.id, email: user.email, displayName: user.displayName } };
    }
    await sendConfirmation(app, sc, user);
    return { kind: 'confirm' };
  }
  await recordFailure(app.db, accountKey(key), ACCOUNT_FREE, MAX_ACCOUNT_GUARD_MIN, 60);
  await recordFailure(app.db, addrKey(addr), ADDRESS_FREE, MAX_ADDRESS_DELAY_S, 1);
  return guarded && !known ? { kind: 'confirm' } : { kind: 'failed' };
}

/** Notes that the person signed in from this address (so a later guard lets it through). */
export async function rememberAddress(db: Db, userId: string, addr: string) {
  await db
    .insert(signInAddresses)
    .values({ userId, address: addr })
    .onConflictDoUpdate({ target: [signInAddresses.userId, signInAddresses.address], set: { lastSeenAt: sql`now()` } });
}

async function sendConfirmation(app: AppContext, sc: ServiceContext, user: { id: string; email: string; displayName: string }) {
  const links = linkSettings(app.config);
  const t = await app.db.transaction(async (tx) => {
    const row = await issueLink(tx, links, { kind: 'sign_in_confirmation', email: user.email });
    await audit(tx, sc, { action: 'sign-in.confirmation-sent', userId: user.id, actorEmail: user.email, entity: 'user', entityId: user.id, after: { address: addressKey(sc.ip) } });
    return row;
  });
  await sendMail(app, sc, {
    to: user.email,
    kind: 'sign-in-confirmation',
    linkTokenId: t.id,
    subject: 'Confirm your Keelson sign-in',
    text: [
      `Hello ${user.displayName},`,
      '',
      `Someone signed in to your Keelson account with your password from an address it has not seen before (${addressKey(sc.ip)}), after several failed attempts on the account.`,
      `If it was you, open this link within ${CONFIRMATION_MINUTES} minutes to finish signing in:`,
      LINK_PLACEHOLDER,
      '',
      'If it was not you, do not open the link: change your password now (or ask your scheme administrator to send you a reset link).',
    ].join('\n'),
  });
}
