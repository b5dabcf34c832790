import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { ROUTES } from '../../server/routing';
import { ROLES, type Role } from '../../constants/permissions';
import { schemeRoles, schemes } from '../../db/schema';
import { Client, startTestServer, type TestServer } from '../helpers/app';
import type { Fixtures } from './route-examples/types';
import { allowed, callExample as call, EXAMPLES, exampleFor, fixtures as fixturesOf, routeKey as key, signInDemoUsers } from './route-examples/harness';

let s: TestServer;
let clients: Record<Role, Client>;
let anon: Client;
let demoUsers: Fixtures['users'];
let isolatedSchemeId: string;

const fixtures = (schemeId: string) => fixturesOf(s, demoUsers, schemeId);

beforeAll(async () => {
  s = await startTestServer();
  anon = new Client(s.baseUrl);
  ({ clients, demoUsers } = await signInDemoUsers(s));
  const [iso] = await s.db.insert(schemes).values({ name: 'Isolated scheme nobody here belongs to' }).returning();
  isolatedSchemeId = iso.id;
});
afterAll(async () => s?.close());

describe('route × role matrix (generated from the permission table)', () => {
  it('has an example or a stated reason for every API route, and no example for a route that does not exist', () => {
    expect(ROUTES.length).toBeGreaterThan(5);
    const missing = ROUTES.map(key).filter((k) => !(k in EXAMPLES));
    expect(missing, 'routes without an example in tests/api/route-examples/').toEqual([]);
    const stale = Object.keys(EXAMPLES).filter((k) => !ROUTES.some((r) => key(r) === k));
    expect(stale, 'examples for routes that do not exist').toEqual([]);
    for (const [k, e] of Object.entries(EXAMPLES)) if (typeof e !== 'function') expect(e.skip.length, k).toBeGreaterThan(10);
  });

  const routesFor = () => ROUTES.filter((r) => exampleFor(r));

  it('answers 401 to a signed-out caller on every guarded route', async () => {
    for (const route of routesFor().filter((r) => r.access !== 'public')) {
      const ex = await exampleFor(route)!(fixtures(s.schemeId));
      const r = await call(anon, route, ex);
      expect(r.status, `${key(route)} signed out`).toBe(401);
    }
  }, 120_000);

  it('answers 2xx to allowed roles and 403 to the others', async () => {
    const failures: string[] = [];
    for (const route of routesFor()) {
      for (const role of ROLES) {
        const ex = await exampleFor(route)!(fixtures(s.schemeId));
        const r = await call(clients[role], route, ex);
        const ok = allowed(route, role) ? r.status >= 200 && r.status < 300 : r.status === 403;
        if (!ok) failures.push(`${key(route)} as ${role}: ${r.status} ${JSON.stringify(r.body).slice(0, 200)}`);
      }
    }
    expect(failures).toEqual([]);
  }, 180_000); // some hundreds of requests (every route × every role): slow on a busy machine

  it("answers 404 for another scheme's id, and for another scheme's objects under one's own scheme, without naming them", async () => {
    const failures: string[] = [];
    for (const route of routesFor().filter((r) => r.path.includes(':schemeId'))) {
      const role = ROLES.find((x) => allowed(route, x))!;
      const ex = await exampleFor(route)!(fixtures(isolatedSchemeId));
      // 1. The whole request aimed at a scheme the caller has no role on.
      const r1 = await call(clients[role], route, ex);
      if (r1.status !== 404 || JSON.stringify(r1.body).includes('Isolated scheme')) failures.push(`${key(route)} other scheme: ${r1.status}`);
      // 2. Objects of that scheme named under the caller's own scheme.
      const otherIds = Object.keys(ex.params ?? {}).filter((p) => p !== 'schemeId');
      if (otherIds.length) {
        const r2 = await call(clients[role], route, { ...ex, params: { ...ex.params, schemeId: s.schemeId } });
        if (r2.status !== 404) failures.push(`${key(route)} foreign object under own scheme: ${r2.status} ${JSON.stringify(r2.body).slice(0, 160)}`);
      }
    }
    expect(failures).toEqual([]);
  }, 120_000);

  it('keeps the demo roles as seeded', async () => {
    const rows = await s.db.select().from(schemeRoles).where(eq(schemeRoles.schemeId, s.schemeId));
    expect(rows.length).toBeGreaterThanOrEqual(5);
  });
});
