import { randomUUID } from 'node:crypto';
import { accessTokens } from '../../../db/schema';
import type { Examples, Fixtures } from './types';

/** A waiting invitation to fx.schemeId (a row only: no mail). */
async function pendingInvitation(fx: Fixtures) {
  const [t] = await fx.db
    .insert(accessTokens)
    .values({ kind: 'invitation', tokenHash: randomUUID().replace(/-/g, '').padEnd(64, '0'), email: `waiting-${fx.nonce}-${randomUUID().slice(0, 6)}@example.org`, schemeId: fx.schemeId, role: 'board', expiresAt: new Date(Date.now() + 86_400_000) })
    .returning();
  return t.id;
}

export const examples: Examples = {
  'POST /auth/sign-in': { skip: 'tests/api/accounts.test.ts signs in, fails and locks out' },
  'POST /auth/sign-out': { skip: 'tests/api/accounts.test.ts signs out and checks the session is gone' },
  'POST /auth/password': { skip: 'tests/api/accounts.test.ts changes a password' },
  'POST /auth/forgot-password': { skip: 'public; tests/api/accounts.test.ts checks the answer is the same for unknown addresses' },
  'GET /auth/links/:token': { skip: 'public; tests/api/accounts.test.ts follows invitation and reset links' },
  'POST /auth/links/:token': { skip: 'public; tests/api/accounts.test.ts accepts an invitation once and only once' },
  'POST /auth/links/:token/accept': { skip: 'tests/api/accounts.test.ts: only the invited person, signed in, can accept' },
  'POST /auth/links/:token/confirm-sign-in': { skip: 'public; tests/api/accounts.test.ts confirms a guarded sign-in from a new address' },
  'GET /health': () => ({}),
  'GET /auth/me': () => ({}),
  'GET /schemes/:schemeId': (fx) => ({ params: { schemeId: fx.schemeId } }),
  'GET /schemes/:schemeId/overview': (fx) => ({ params: { schemeId: fx.schemeId } }),
  'GET /schemes/:schemeId/people': (fx) => ({ params: { schemeId: fx.schemeId } }),
  'POST /schemes/:schemeId/invitations': (fx) => ({ params: { schemeId: fx.schemeId }, body: { email: `new-${fx.nonce}@example.org`, role: 'trustee' } }),
  'POST /schemes/:schemeId/invitations/:invitationId/resend': async (fx) => ({ params: { schemeId: fx.schemeId, invitationId: await pendingInvitation(fx) } }),
  'DELETE /schemes/:schemeId/invitations/:invitationId': async (fx) => ({ params: { schemeId: fx.schemeId, invitationId: await pendingInvitation(fx) } }),
  'PATCH /schemes/:schemeId/people/:userId': async (fx) => ({ params: { schemeId: fx.schemeId, userId: (await fx.makeUser('trustee')).id }, body: { role: 'board' } }),
  'DELETE /schemes/:schemeId/people/:userId': async (fx) => ({ params: { schemeId: fx.schemeId, userId: (await fx.makeUser('trustee')).id } }),
  'POST /schemes/:schemeId/people/:userId/reset-link': async (fx) => ({ params: { schemeId: fx.schemeId, userId: (await fx.makeUser('board')).id } }),
  'GET /schemes/:schemeId/activity': (fx) => ({ params: { schemeId: fx.schemeId } }),
};
