import { randomBytes } from 'node:crypto';
import { users, schemeRoles } from '../../../db/schema';
import { DEMO_USERS } from '../../../db/seed';
import { can, type Role } from '../../../constants/permissions';
import type { RouteSpec } from '../../../server/routing';
import { Client, type TestServer } from '../../helpers/app';
import type { Example, ExampleEntry, Examples, Fixtures } from './types';

/** Every other file in route-examples/ contributes examples. */
const modules = (import.meta as unknown as { glob: (p: string[], o: { eager: true }) => Record<string, { examples?: Examples }> }).glob(['./*.ts', '!./harness.ts', '!./types.ts'], { eager: true });
export const EXAMPLES: Examples = Object.assign({}, ...Object.values(modules).map((m) => m.examples ?? {}));

export const routeKey = (r: RouteSpec) => `${r.method.toUpperCase()} ${r.path}`;

/** The example builder of a route, or undefined when it has none or is skipped. */
export function exampleFor(route: RouteSpec): Exclude<ExampleEntry, { skip: string }> | undefined {
  const e = EXAMPLES[routeKey(route)];
  return typeof e === 'function' ? e : undefined;
}

/** The route's path with the example's parameters filled in. */
export function fillPath(path: string, params: Example['params'] = {}): string {
  return path.replace(/:([A-Za-z]+)/g, (_, name: string) => {
    if (!(name in params)) throw new Error(`example for ${path} gives no :${name}`);
    return encodeURIComponent(params[name]);
  });
}

/** Signs in one client per demo role and returns them with the demo users' ids. */
export async function signInDemoUsers(s: TestServer): Promise<{ clients: Record<Role, Client>; demoUsers: Fixtures['users'] }> {
  const rows = await s.db.select({ id: users.id, email: users.email }).from(users);
  const demoUsers = Object.fromEntries(DEMO_USERS.map((d) => [d.role, rows.find((r) => r.email === d.email)!])) as Fixtures['users'];
  const clients = {} as Record<Role, Client>;
  for (const d of DEMO_USERS) {
    clients[d.role] = new Client(s.baseUrl);
    await clients[d.role].signIn(d.email);
  }
  return { clients, demoUsers };
}

/** Fresh fixtures for one example request about `schemeId`. */
export function fixtures(s: TestServer, demoUsers: Fixtures['users'], schemeId: string): Fixtures {
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

/** Whether the permission table lets `role` call the route. */
export function allowed(route: RouteSpec, role: Role): boolean {
  if (route.access === 'public' || route.access === 'signed-in') return true;
  return can(role, route.access);
}

/** Calls the route as `client` with the example's parameters, query and body (or form). */
export function callExample(client: Client, route: RouteSpec, ex: Example) {
  let path = fillPath(route.path, ex.params);
  if (ex.query) path += `?${new URLSearchParams(ex.query)}`;
  const body = ex.form ? ex.form() : route.method === 'get' ? undefined : (ex.body ?? {});
  return client.call(route.method.toUpperCase(), path, body);
}
