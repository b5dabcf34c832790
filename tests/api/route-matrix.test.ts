import { randomBytes } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { ROUTES, type RouteSpec } from '../../server/routing';
import { can, ROLES, type Role } from '../../constants/permissions';
import { schemeRoles, schemes, users } from '../../db/schema';
import { DEMO_USERS } from '../../db/seed';
import { Client, startTestServer, type TestServer } from '../helpers/app';
import type { Example, ExampleEntry, Examples, Fixtures } from './route-examples/types';

// Every file in route-examples/ contributes examples; together they must cover ROUTES.
const modules = (import.meta as unknown as { glob: (p: string, o: { eager: true }) => Record<string, { examples?: Examples }> }).glob('./route-examples/*.ts', { eager: true });
const EXAMPLES: Examples = Object.assign({}, ...Object.values(modules).map((m) => m.examples ?? {}));

const key = (r: RouteSpec) => `${r.method.toUpperCase()} ${r.path}`;

let s: TestServer;
const clients = {} as Record<Role, Client>;
let anon: Client;
let demoUsers: Fixtures['users'];
let isolatedSchemeId: string;

function fixtures(schemeId: string): Fixtures {
  return {
    db: s.db,
    schemeId,
    nonce: randomBytes(4).toString('hex'),
    users: demoUsers,
    makeUser: async (role) => {
      const [u] = await s.db.insert(users).values({ email: `u-${randomBytes(5).toString('hex')}@example.org`, displayName: 'Fixture person' }).returning();
      await s.db.insert(schemeRoles).values({ userId: u.id, schemeId, role });
      return { id: u.id, email: u.email };
    },
  };
}

function fill(path: string, params: Record<string, string> = {}): string {
  return path.replace(/:([A-Za-z]+)/g, (_, name: string) => {
    if (!(name in params)) throw new Error(`example for ${path} gives no :${name}`);
    return encodeURIComponent(params[name]);
  });
}

async function call(c: Client, route: RouteSpec, ex: Example) {
  let path = fill(route.path, ex.params);
  if (ex.query) path += `?${new URLSearchParams(ex.query)}`;
  const body = ex.form ? ex.form() : route.method === 'get' ? undefined : (ex.body ?? {});
  return c.call(route.method.toUpperCase(), path, body);
}

function allowed(route: RouteSpec, role: Role): boolean {
  if (route.access === 'public' || route.access === 'signed-in') return true;
  return can(role, route.access);
}

beforeAll(async () => {
  s = await startTestServer();
  anon = new Client(s.baseUrl);
  const rows = await s.db.select({ id: users.id, email: users.email }).from(users);
  demoUsers = Object.fromEntries(DEMO_USERS.map((d) => [d.role, rows.find((r) => r.email === d.email)!])) as Fixtures['users'];
  for (const d of DEMO_USERS) {
    clients[d.role] = new Client(s.baseUrl);
    await clients[d.role].signIn(d.email);
  }
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

  const routesFor = () => ROUTES.filter((r) => typeof EXAMPLES[key(r)] === 'function');

  it('answers 401 to a signed-out caller on every guarded route', async () => {
    for (const route of routesFor().filter((r) => r.access !== 'public')) {
      const ex = await (EXAMPLES[key(route)] as Exclude<ExampleEntry, { skip: string }>)(fixtures(s.schemeId));
      const r = await call(anon, route, ex);
      expect(r.status, `${key(route)} signed out`).toBe(401);
    }
  });

  it('answers 2xx to allowed roles and 403 to the others', async () => {
    const failures: string[] = [];
    for (const route of routesFor()) {
      for (const role of ROLES) {
        const ex = await (EXAMPLES[key(route)] as Exclude<ExampleEntry, { skip: string }>)(fixtures(s.schemeId));
        const r = await call(clients[role], route, ex);
        const ok = allowed(route, role) ? r.status >= 200 && r.status < 300 : r.status === 403;
        if (!ok) failures.push(`${key(route)} as ${role}: ${r.status} ${JSON.stringify(r.body).slice(0, 200)}`);
      }
    }
    expect(failures).toEqual([]);
  });

  it("answers 404 for another scheme's id, and for another scheme's objects under one's own scheme, without naming them", async () => {
    const failures: string[] = [];
    for (const route of routesFor().filter((r) => r.path.includes(':schemeId'))) {
      const role = ROLES.find((x) => allowed(route, x))!;
      const ex = await (EXAMPLES[key(route)] as Exclude<ExampleEntry, { skip: string }>)(fixtures(isolatedSchemeId));
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
  });

  it('keeps the demo roles as seeded', async () => {
    const rows = await s.db.select().from(schemeRoles).where(eq(schemeRoles.schemeId, s.schemeId));
    expect(rows.length).toBeGreaterThanOrEqual(5);
  });
});
