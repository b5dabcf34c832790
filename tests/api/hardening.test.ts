import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { projectionRuns } from '../../db/schema';
import { MAX_JSON_DEPTH } from '../../server/errors';
import { Client, startTestServer, type TestServer } from '../helpers/app';
import { insertFinishedRun } from './route-examples/reports';

let s: TestServer;
let trustee: Client;
let comms: Client;
let admin: Client;
const S = () => `/schemes/${s.schemeId}`;

beforeAll(async () => {
  s = await startTestServer();
  trustee = new Client(s.baseUrl);
  await trustee.signIn('trustee@fernleigh.example');
  comms = new Client(s.baseUrl);
  await comms.signIn('comms@fernleigh.example');
  admin = new Client(s.baseUrl);
  await admin.signIn('admin@fernleigh.example');
});
afterAll(async () => s?.close());

describe('requests that used to fail with 500', () => {
  it(`refuses JSON nested deeper than ${MAX_JSON_DEPTH} levels with 400, before parsing, signed out`, async () => {
    const body = '['.repeat(8000) + ']'.repeat(8000);
    const res = await fetch(`${s.baseUrl}/api/auth/sign-in`, { method: 'POST', headers: { 'Content-Type': 'application/json', 'X-Keelson-Client': '1' }, body });
    expect(res.status).toBe(400);
    const j = await res.json();
    expect(j.message).toMatch(/nests .* more than 32 levels/);
    expect(JSON.stringify(j)).not.toMatch(/stack|at .*\.js/);
    // Brackets inside strings do not count; an ordinary body still works.
    const ok = await fetch(`${s.baseUrl}/api/auth/forgot-password`, { method: 'POST', headers: { 'Content-Type': 'application/json', 'X-Keelson-Client': '1' }, body: JSON.stringify({ email: `${'['.repeat(40)}@x.org` }) });
    expect(ok.status).toBe(400);
    expect((await ok.json()).issues[0].path).toBe('email');
  });

  it('answers 404 for a scheme id of 36 dashes', async () => {
    const r = await trustee.get(`/schemes/${'-'.repeat(36)}/overview`);
    expect(r.status).toBe(404);
  });

  it('states a statement for a member paying 99% of salary (the what-if stops at 100%)', async () => {
    const { run, input, options, member } = await insertFinishedRun(s.db, s.schemeId, { paths: 200 });
    const scenario = { ...input.scenario, members: input.scenario.members.map((m) => ({ ...m, contributionRate: 0.99 })) };
    await s.db.update(projectionRuns).set({ input: { ...input, scenario } }).where(eq(projectionRuns.id, run.id));
    const r = await comms.get(`${S()}/statements/preview?runId=${run.id}&optionId=${options[0].id}&memberId=${member.id}`);
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    expect(r.body.figures.whatIf.extraContribution).toBeGreaterThanOrEqual(0);
  });
});

describe('input bounds', () => {
  it('refuses a salary of 1e300 (and a pot beyond any pension) with a 400 naming the field', async () => {
    const base = { label: 'Huge earner', age: 40, retirementAge: 66, salary: 40_000, salaryGrowth: null, contributionRate: 0.08, pot: 10_000 };
    const a = await trustee.post(`${S()}/illustrative-members`, { ...base, salary: 1e300 });
    expect(a.status).toBe(400);
    expect(a.body.issues).toEqual([expect.objectContaining({ path: 'salary' })]);
    const b = await trustee.post(`${S()}/illustrative-members`, { ...base, pot: 1e12 });
    expect(b.status).toBe(400);
    expect(b.body.issues).toEqual([expect.objectContaining({ path: 'pot' })]);
  });

  it('refuses a report title with a line break', async () => {
    const { run } = await insertFinishedRun(s.db, s.schemeId, { paths: 100 });
    const r = await trustee.post(`${S()}/reports`, { runId: run.id, title: 'Quarterly review\r\nBcc: someone@example.org' });
    expect(r.status).toBe(400);
    expect(r.body.issues[0].path).toBe('title');
  });

  it.each(['-1+1', '=cmd|calc', '+44', '@SUM(A1)'])('refuses a membership reference starting like a spreadsheet formula: %s', async (ref) => {
    const csv = `reference,age,salary,pot,contribution_rate,retirement_age\nM-0001,40,30000,20000,0.08,66\n${ref},41,31000,21000,0.08,66\n`;
    const form = new FormData();
    form.append('file', new Blob([csv], { type: 'text/csv' }), 'members.csv');
    const r = await admin.call('POST', `${S()}/membership`, form);
    expect(r.status).toBe(400);
    expect(r.body.issues).toEqual(expect.arrayContaining([expect.objectContaining({ line: 3, column: 'reference', message: expect.stringMatching(/letter or digit/) })]));
  });
});

describe('responses', () => {
  it('mark every API answer Cache-Control: no-store', async () => {
    for (const p of ['/health', '/auth/me', `${S()}/overview`, '/no-such-route']) {
      const r = await trustee.get(p);
      expect(r.headers.get('cache-control'), p).toBe('no-store');
    }
  });

  it("give the communications officer a run without its fund assumptions, as the assumptions routes would", async () => {
    const { run } = await insertFinishedRun(s.db, s.schemeId, { paths: 100 });
    expect((await comms.get(`${S()}/assumption-sets`)).status).toBe(403);
    const c = await comms.get(`${S()}/runs/${run.id}`);
    expect(c.status).toBe(200);
    expect(c.body.assumptionsWithheld).toBe(true);
    expect(c.body.input.scenario.correlations).toBeUndefined();
    for (const f of c.body.input.scenario.funds) expect(Object.keys(f).sort()).toEqual(['id', 'name']);
    expect(JSON.stringify(c.body.input)).not.toMatch(/expectedReturn|volatility|annualCharge/);
    // The results themselves are there, and the trustee still sees everything.
    expect(c.body.result.base.result.results.length).toBeGreaterThan(0);
    const t = await trustee.get(`${S()}/runs/${run.id}`);
    expect(t.body.input.scenario.funds[0].expectedReturn).toBeGreaterThan(0);
  });
});
