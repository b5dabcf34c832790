import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROUTES } from '../../server/routing';
import { ROLES, type Role } from '../../constants/permissions';
import { users } from '../../db/schema';
import { Client, startTestServer, type TestServer } from '../helpers/app';
import type { Example, Fixtures } from './route-examples/types';
import { allowed, exampleFor, fillPath, fixtures as fixturesOf, signInDemoUsers } from './route-examples/harness';

/**
 * Every JSON field of every route's example request is replaced, one at a
 * time, by hostile values. The answer must be a 400 naming that field, or a
 * non-error answer with the value stored and returned inert (as JSON data) —
 * never a 500.
 */

const HOSTILE: [string, unknown][] = [
  ['SQL injection', "x'); DROP TABLE users; --"],
  ['SQL tautology', "' OR '1'='1"],
  ['HTML script', '<script>alert("x")</script>'],
  ['HTML attribute', '"><img src=x onerror=alert(1)>'],
  ['very long string', 'x'.repeat(200_000)],
  ['number', 12345],
  ['negative number', -1e308],
  ['null', null],
  ['array', ['a', 1]],
  ['object', { $ne: 1 }],
  ['boolean', true],
  ['NUL byte', 'a\u0000b'],
];

type Path = (string | number)[];
function fieldPaths(v: unknown, prefix: Path = [], depth = 0): Path[] {
  if (depth > 3 || v === null || typeof v !== 'object') return prefix.length ? [prefix] : [];
  const out: Path[] = prefix.length ? [prefix] : [];
  if (Array.isArray(v)) {
    if (v.length) out.push(...fieldPaths(v[0], [...prefix, 0], depth + 1));
  } else {
    for (const [k, x] of Object.entries(v)) out.push(...fieldPaths(x, [...prefix, k], depth + 1));
  }
  return out;
}

function setAt(body: unknown, path: Path, value: unknown): unknown {
  const copy = structuredClone(body) as Record<string | number, unknown>;
  let o: Record<string | number, unknown> = copy;
  for (const k of path.slice(0, -1)) o = o[k] as Record<string | number, unknown>;
  o[path[path.length - 1]] = value;
  return copy;
}

let s: TestServer;
let clients: Record<Role, Client>;
let demoUsers: Fixtures['users'];

const fixtures = () => fixturesOf(s, demoUsers, s.schemeId);

beforeAll(async () => {
  s = await startTestServer();
  ({ clients, demoUsers } = await signInDemoUsers(s));
});
afterAll(async () => s?.close());

const withBodies = () => ROUTES.filter((r) => r.method !== 'get' && exampleFor(r));

describe('hostile input in every form field', () => {
  it('covers at least the account forms', () => {
    expect(withBodies().length).toBeGreaterThan(0);
  });

  it('is rejected with a 400 naming the field, or stored and returned inert — never a 500', { timeout: 180_000 }, async () => {
    const failures: string[] = [];
    let cases = 0;
    for (const route of withBodies()) {
      const entry = exampleFor(route)!;
      const role = ROLES.find((r) => allowed(route, r))!;
      const probe = await entry(fixtures());
      if (probe.form || probe.body === undefined) continue;
      for (const path of fieldPaths(probe.body)) {
        for (const [label, value] of HOSTILE) {
          const ex: Example = await entry(fixtures());
          const body = setAt(ex.body, path, value);
          const url = fillPath(route.path, ex.params);
          const r = await clients[role].call(route.method.toUpperCase(), url, body);
          cases++;
          const where = `${route.method.toUpperCase()} ${route.path} ${path.join('.')} ← ${label}`;
          if (r.status >= 500) failures.push(`${where}: ${r.status}`);
          else if (r.status === 400) {
            const named = (r.body?.issues ?? []).some((i: { path: string }) => i.path === path.join('.') || i.path.startsWith(`${path.join('.')}.`) || path.join('.').startsWith(i.path));
            if (!named) failures.push(`${where}: 400 without naming the field: ${JSON.stringify(r.body).slice(0, 200)}`);
          } else if (!(r.headers.get('content-type') ?? '').includes('application/json')) failures.push(`${where}: answered ${r.headers.get('content-type')}`);
        }
      }
    }
    expect(cases).toBeGreaterThan(20);
    expect(failures).toEqual([]);
  }); // hundreds of requests in a row: a time limit here would only measure how busy the machine is (hence the generous timeout above)

  it('treats the signed-out and account forms the same way', async () => {
    const anon = () => new Client(s.baseUrl);
    const forms: { name: string; send: (body: Record<string, unknown>) => Promise<{ status: number; body: { issues?: { path: string }[] } }>; body: Record<string, unknown> }[] = [
      { name: 'sign-in', send: (b) => anon().post('/auth/sign-in', b), body: { email: 'board@fernleigh.example', password: 'keelson-demo-2026x' } },
      { name: 'forgot-password', send: (b) => anon().post('/auth/forgot-password', b), body: { email: 'board@fernleigh.example' } },
      { name: 'one-use link', send: (b) => anon().post('/auth/links/not-a-real-token', b), body: { password: 'a-good-long-password', displayName: 'Someone' } },
      { name: 'change password', send: (b) => clients.trustee.post('/auth/password', b), body: { currentPassword: 'wrong-current', newPassword: 'a-good-long-password' } },
    ];
    const failures: string[] = [];
    for (const f of forms) {
      for (const field of Object.keys(f.body)) {
        for (const [label, value] of HOSTILE) {
          const r = await f.send({ ...f.body, [field]: value });
          if (r.status >= 500) failures.push(`${f.name}.${field} ← ${label}: ${r.status}`);
          // A hostile value can be a valid value (a password may contain SQL); the 400 must then still name a field of the form.
          if (r.status === 400 && !(r.body.issues ?? []).some((i) => i.path === field || (i.path in f.body && typeof value === 'string' && value.length <= 200)))
            failures.push(`${f.name}.${field} ← ${label}: 400 not naming ${field}`);
        }
      }
    }
    expect(failures).toEqual([]);
  });

  it('stores an HTML-looking name as plain data and returns it unchanged', async () => {
    const c = clients.administrator;
    expect((await c.post(`/schemes/${s.schemeId}/invitations`, { email: 'html-name@example.org', role: 'board' })).status).toBe(201);
    const token = await s.tokenFor('html-name@example.org', 'invitation');
    const name = '<b onmouseover="alert(1)">Robert\'); DROP TABLE users;--</b>';
    expect((await new Client(s.baseUrl).post(`/auth/links/${token}`, { password: 'a-good-long-password', displayName: name })).status).toBe(200);
    const me = await new Client(s.baseUrl).signIn('html-name@example.org', 'a-good-long-password');
    expect(me.user.displayName).toBe(name);
    expect((await s.db.select().from(users)).length).toBeGreaterThan(5);
  });
});
