import type { Examples } from './types';

export const examples: Examples = {
  'POST /auth/sign-in': { skip: 'tests/api/accounts.test.ts signs in, fails and locks out' },
  'POST /auth/sign-out': { skip: 'tests/api/accounts.test.ts signs out and checks the session is gone' },
  'POST /auth/password': { skip: 'tests/api/accounts.test.ts changes a password' },
  'POST /auth/forgot-password': { skip: 'public; tests/api/accounts.test.ts checks the answer is the same for unknown addresses' },
  'GET /auth/links/:token': { skip: 'public; tests/api/accounts.test.ts follows invitation and reset links' },
  'POST /auth/links/:token': { skip: 'public; tests/api/accounts.test.ts accepts an invitation once and only once' },
  'GET /health': () => ({}),
  'GET /auth/me': () => ({}),
  'GET /schemes/:schemeId': (fx) => ({ params: { schemeId: fx.schemeId } }),
  'GET /schemes/:schemeId/overview': (fx) => ({ params: { schemeId: fx.schemeId } }),
  'GET /schemes/:schemeId/people': (fx) => ({ params: { schemeId: fx.schemeId } }),
  'POST /schemes/:schemeId/invitations': (fx) => ({ params: { schemeId: fx.schemeId }, body: { email: `new-${fx.nonce}@example.org`, role: 'trustee' } }),
  'PATCH /schemes/:schemeId/people/:userId': async (fx) => ({ params: { schemeId: fx.schemeId, userId: (await fx.makeUser('trustee')).id }, body: { role: 'board' } }),
  'DELETE /schemes/:schemeId/people/:userId': async (fx) => ({ params: { schemeId: fx.schemeId, userId: (await fx.makeUser('trustee')).id } }),
  'POST /schemes/:schemeId/people/:userId/reset-link': async (fx) => ({ params: { schemeId: fx.schemeId, userId: (await fx.makeUser('board')).id } }),
  'GET /schemes/:schemeId/activity': (fx) => ({ params: { schemeId: fx.schemeId } }),
};
