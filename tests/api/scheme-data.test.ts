import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import { assumptionSets, auditEvents, funds, schemeMembers } from '../../db/schema';
import { Client, startTestServer, type TestServer } from '../helpers/app';

let s: TestServer;
let act: Client;
let trustee: Client;
let admin: Client;
let board: Client;
let base: string;
let fundIds: string[];

beforeAll(async () => {
  s = await startTestServer();
  act = new Client(s.baseUrl);
  await act.signIn('actuary@fernleigh.example');
  trustee = new Client(s.baseUrl);
  await trustee.signIn('trustee@fernleigh.example');
  admin = new Client(s.baseUrl);
  await admin.signIn('admin@fernleigh.example');
  board = new Client(s.baseUrl);
  await board.signIn('board@fernleigh.example');
  base = `/schemes/${s.schemeId}`;
  const r = await act.get(`${base}/funds`);
  fundIds = r.body.funds.map((f: { id: string }) => f.id);
});
afterAll(async () => s?.close());

const auditCount = async () => Number(((await s.db.execute(sql`select count(*)::int as n from audit_events where scheme_id = ${s.schemeId}`)).rows[0] as { n: number }).n);
const paths = (body: { issues?: { path: string }[] }) => (body.issues ?? []).map((i) => i.path);

function csv(name: string, text: string, type = 'text/csv') {
  const fd = new FormData();
  fd.append('file', new Blob([text], { type }), name);
  return fd;
}

function validSet(ids = fundIds) {
  return {
    setAt: '2027-03-31',
    rationale: 'Quarterly review',
    inflation: 0.025,
    salaryGrowth: 0.03,
    annuityRealRate: 0.012,
    annuityYears: 25,
    funds: ids.map((fundId, i) => ({ fundId, expectedReturn: 0.03 + 0.01 * i, volatility: 0.02 + 0.03 * i, annualCharge: 0.002 })),
    correlations: ids.map((_, i) => ids.map((__, j): number => (i === j ? 1 : 0.2))),
  };
}

describe('funds', () => {
  it('answers 400 with field paths for bad input and changes nothing', async () => {
    const before = await auditCount();
    const r = await act.post(`${base}/funds`, { name: '   ', assetClass: 'x'.repeat(300), colour: 'red' });
    expect(r.status).toBe(400);
    expect(paths(r.body)).toEqual(expect.arrayContaining(['name', 'assetClass']));
    expect(await auditCount()).toBe(before);
  });

  it('creates and renames a fund with an audit event holding before and after', async () => {
    const c = await act.post(`${base}/funds`, { name: 'Fernleigh Property', assetClass: 'UK commercial property' });
    expect(c.status).toBe(201);
    const p = await act.patch(`${base}/funds/${c.body.id}`, { name: 'Fernleigh Property Units' });
    expect(p.status).toBe(200);
    const [ev] = await s.db.select().from(auditEvents).where(and(eq(auditEvents.entityId, c.body.id), eq(auditEvents.action, 'fund.updated')));
    expect(ev.before).toMatchObject({ name: 'Fernleigh Property' });
    expect(ev.after).toMatchObject({ name: 'Fernleigh Property Units' });
    expect((await act.post(`${base}/funds`, { name: 'fernleigh property units' })).status).toBe(409);
    expect((await act.delete(`${base}/funds/${c.body.id}`)).status).toBe(200);
  });

  it('refuses to remove a fund that an assumption set or option uses, saying which', async () => {
    const equity = (await act.get(`${base}/funds`)).body.funds.find((f: { name: string }) => f.name === 'Fernleigh Global Equity');
    const r = await act.delete(`${base}/funds/${equity.id}`);
    expect(r.status).toBe(409);
    expect(r.body.message).toMatch(/assumption set/);
    expect(r.body.message).toMatch(/Long-horizon growth/);
  });
});

describe('assumption sets', () => {
  type SetBody = ReturnType<typeof validSet>;
  it.each<[string, (b: SetBody) => object, string]>([
    ['inflation given as text', () => ({ inflation: '2.5%' }), 'inflation'],
    ['a date that is not a date', () => ({ setAt: '31/03/2027' }), 'setAt'],
    ['a negative volatility', (b) => ({ funds: b.funds.map((f, i) => (i === 2 ? { ...f, volatility: -0.1 } : f)) }), 'funds.2.volatility'],
    ['a charge of 150%', (b) => ({ funds: b.funds.map((f, i) => (i === 1 ? { ...f, annualCharge: 1.5 } : f)) }), 'funds.1.annualCharge'],
    ['annuity years as a fraction', () => ({ annuityYears: 22.5 }), 'annuityYears'],
    ['an unknown field', () => ({ colour: 'blue' }), '(body)'],
    ['a matrix with the wrong number of rows', () => ({ correlations: [[1]] }), 'correlations'],
  ])('answers 400 for %s, naming the field', async (_name, patch, path) => {
    const before = await auditCount();
    const body = validSet();
    const r = await act.post(`${base}/assumption-sets`, { ...body, ...patch(body) });
    expect(r.status, JSON.stringify(r.body)).toBe(400);
    expect(paths(r.body)).toContain(path);
    expect(await auditCount()).toBe(before);
  });

  it('rejects a correlation matrix that is not symmetric, not unit-diagonal or outside [-1, 1], naming the entries', async () => {
    const m = validSet().correlations;
    m[0][1] = 0.5; // [1][0] stays 0.2
    m[3][3] = 0.9;
    let r = await act.post(`${base}/assumption-sets`, { ...validSet(), correlations: m });
    expect(r.status).toBe(400);
    expect(paths(r.body)).toEqual(expect.arrayContaining(['correlations.0.1', 'correlations.3.3']));
    expect(r.body.issues.find((i: { path: string }) => i.path === 'correlations.0.1').message).toMatch(/not symmetric/);
    const out = validSet().correlations;
    out[1][2] = out[2][1] = 1.4;
    r = await act.post(`${base}/assumption-sets`, { ...validSet(), correlations: out });
    expect(r.status).toBe(400);
    expect(paths(r.body)).toEqual(expect.arrayContaining(['correlations.1.2', 'correlations.2.1']));
  });

  it('rejects a matrix that is not positive semidefinite and reports the eigenvalue at fault', async () => {
    // Three funds each −0.9 correlated with the others: eigenvalue 1 + 2(−0.9) = −0.8 < 0.
    const ids = fundIds.slice(0, 3);
    const r = await act.post(`${base}/assumption-sets`, { ...validSet(ids), correlations: ids.map((_, i) => ids.map((__, j) => (i === j ? 1 : -0.9))) });
    expect(r.status).toBe(400);
    const issue = r.body.issues.find((i: { path: string }) => i.path === 'correlations');
    expect(issue.message).toMatch(/positive semidefinite/);
    expect(issue.message).toMatch(/-0\.8/);
  });

  it("answers 400 for another scheme's fund, naming the position", async () => {
    const [other] = await s.db.insert(funds).values({ schemeId: s.secondSchemeId, name: 'Elsewhere fund' }).returning();
    const body = validSet();
    body.funds[1].fundId = other.id;
    const r = await act.post(`${base}/assumption-sets`, body);
    expect(r.status).toBe(400);
    expect(paths(r.body)).toEqual(['funds.1.fundId']);
  });

  it('creates a draft, lets the actuary edit it, and once a trustee approves it refuses every change with 409', async () => {
    const c = await act.post(`${base}/assumption-sets`, validSet());
    expect(c.status).toBe(201);
    expect(c.body).toMatchObject({ version: 2, status: 'draft', createdBy: 'Sunniva Achterberg' });
    const id = c.body.id;
    const edited = { ...validSet(), inflation: 0.03 };
    expect((await act.put(`${base}/assumption-sets/${id}`, edited)).body.inflation).toBe(0.03);
    // A trustee cannot edit; the actuary cannot approve.
    expect((await trustee.put(`${base}/assumption-sets/${id}`, edited)).status).toBe(403);
    expect((await act.post(`${base}/assumption-sets/${id}/approve`)).status).toBe(403);

    const a = await trustee.post(`${base}/assumption-sets/${id}/approve`);
    expect(a.status).toBe(200);
    expect(a.body).toMatchObject({ status: 'approved', approvedBy: 'Idris Pellow' });
    expect(new Date(a.body.approvedAt).getTime()).toBeGreaterThan(Date.now() - 60_000);

    const before = await auditCount();
    const put = await act.put(`${base}/assumption-sets/${id}`, { ...edited, inflation: 0.04 });
    expect(put.status).toBe(409);
    expect(put.body.message).toMatch(/Version 2 was approved by Idris Pellow on \d{1,2} [A-Z][a-z]+ \d{4} and can no longer change/);
    expect(put.body.message).toMatch(/new draft/);
    expect((await act.delete(`${base}/assumption-sets/${id}`)).status).toBe(409);
    expect((await trustee.post(`${base}/assumption-sets/${id}/approve`)).status).toBe(409);
    const [row] = await s.db.select().from(assumptionSets).where(eq(assumptionSets.id, id));
    expect(row.inflation).toBe(0.03);
    expect(await auditCount()).toBe(before);

    // A change starts a new draft copied from it.
    const d = await act.post(`${base}/assumption-sets/${id}/drafts`);
    expect(d.status).toBe(201);
    expect(d.body).toMatchObject({ version: 3, status: 'draft', basedOnId: id, basedOnVersion: 2, inflation: 0.03 });
    expect(d.body.funds.map((f: { fundId: string }) => f.fundId)).toEqual(fundIds);

    const events = await s.db.select().from(auditEvents).where(eq(auditEvents.entityId, id));
    expect(events.map((e) => e.action)).toEqual(expect.arrayContaining(['assumptions.draft-created', 'assumptions.draft-updated', 'assumptions.approved']));
    const upd = events.find((e) => e.action === 'assumptions.draft-updated')!;
    expect(upd.before).toMatchObject({ inflation: 0.025 });
    expect(upd.after).toMatchObject({ inflation: 0.03 });
  });

  it('lists versions with who approved them and compares two side by side', async () => {
    const list = await board.get(`${base}/assumption-sets`);
    expect(list.status).toBe(200);
    const v1 = list.body.sets.find((x: { version: number }) => x.version === 1);
    expect(v1).toMatchObject({ status: 'approved', approvedBy: 'Idris Pellow' });
    const c = await act.post(`${base}/assumption-sets/${v1.id}/drafts`);
    const body = validSet();
    const old = (await act.get(`${base}/assumption-sets/${v1.id}`)).body;
    body.funds = old.funds.map((f: { fundId: string; expectedReturn: number; volatility: number; annualCharge: number }) => ({ fundId: f.fundId, expectedReturn: f.expectedReturn, volatility: f.volatility, annualCharge: f.annualCharge }));
    body.funds[0].expectedReturn = 0.065;
    body.correlations = old.correlations.map((r: number[]) => r.slice());
    body.correlations[0][1] = body.correlations[1][0] = 0.75;
    body.inflation = old.inflation;
    await act.put(`${base}/assumption-sets/${c.body.id}`, body);
    const cmp = await board.get(`${base}/assumption-sets/${v1.id}/compare/${c.body.id}`);
    expect(cmp.status).toBe(200);
    const eq0 = cmp.body.funds.find((f: { fundId: string }) => f.fundId === old.funds[0].fundId);
    expect(eq0.changed).toEqual(['expectedReturn']);
    expect(eq0.a.expectedReturn).toBe(0.07);
    expect(eq0.b.expectedReturn).toBe(0.065);
    expect(cmp.body.funds.filter((f: { changed: string[] }) => f.changed.length)).toHaveLength(1);
    expect(cmp.body.correlations).toEqual([expect.objectContaining({ a: 0.8, b: 0.75 })]);
    expect(cmp.body.fields.find((f: { field: string }) => f.field === 'inflation').changed).toBe(false);
    expect(cmp.body.fields.find((f: { field: string }) => f.field === 'setAt').changed).toBe(true);
  });
});

/** Month-end dates from January 2020 on. */
function monthEnds(n: number): string[] {
  return Array.from({ length: n }, (_, k) => new Date(Date.UTC(2020, k + 1, 0)).toISOString().slice(0, 10));
}

describe('assumptions from a price history', () => {
  it('computes suggestions with the period and the number of months, and stores nothing', async () => {
    const names = (await act.get(`${base}/funds`)).body.funds.map((f: { name: string }) => f.name);
    // Equity alternates +10%, −10%, +10%; cash grows 0.5% a month.
    const rows = ['100,100', '110,100.5', '99,101.0025', '108.9,101.5075125'];
    const text = `date,${names[0]},${names[4]}\n${monthEnds(4)
      .map((d, i) => `${d},${rows[i]}`)
      .join('\n')}\n`;
    const before = await auditCount();
    const sets = await s.db.select({ n: sql<number>`count(*)::int` }).from(assumptionSets);
    const r = await act.post(`${base}/assumption-sets/history`, csv('history.csv', text));
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    expect(r.body).toMatchObject({ from: '2020-01-31', to: '2020-04-30', months: 3, thin: true });
    expect(r.body.funds[0].name).toBe(names[0]);
    expect(r.body.funds[0].annualVolatility).toBeCloseTo(0.4, 12); // √12 · √(1/75)
    expect(r.body.funds[0].annualReturn).toBeCloseTo(Math.pow(1 + 0.1 / 3, 12) - 1, 12);
    expect(r.body.funds[1].annualReturn).toBeCloseTo(Math.pow(1.005, 12) - 1, 10);
    expect(r.body.method).toMatch(/\(1 \+ m̄\)¹² − 1/);
    const [latest] = await s.db.select({ v: sql<number>`max(version)::int` }).from(assumptionSets).where(and(eq(assumptionSets.schemeId, s.schemeId), eq(assumptionSets.status, 'approved')));
    expect(r.body.current.version).toBe(latest.v);
    expect(await auditCount()).toBe(before);
    expect(await s.db.select({ n: sql<number>`count(*)::int` }).from(assumptionSets)).toEqual(sets);
  });

  it('reports a bad line 57 by line and column, with every other bad line, and nothing else', async () => {
    const names = (await act.get(`${base}/funds`)).body.funds.map((f: { name: string }) => f.name);
    const dates = monthEnds(80);
    const lines = [`date,${names[0]},${names[2]}`, ...dates.map((d, i) => `${d},${(100 * 1.005 ** i).toFixed(4)},${(100 * 1.002 ** i).toFixed(4)}`)];
    lines[56] = lines[56].replace(/,[^,]+$/, ',n/a'); // file line 57 (lines[0] is line 1)
    lines[69] = lines[69].replace(/,[^,]+,/, ',-3,'); // file line 70
    const r = await act.post(`${base}/assumption-sets/history`, csv('prices.csv', `${lines.join('\n')}\n`));
    expect(r.status).toBe(400);
    expect(r.body.issues).toEqual([
      expect.objectContaining({ line: 57, column: names[2], message: '"n/a" is not a number' }),
      expect.objectContaining({ line: 70, column: names[0], message: expect.stringMatching(/above 0/) }),
    ]);
    expect(r.body.message).toMatch(/2 problems on 2 lines; nothing was stored/);
  });

  it('names unknown fund columns, missing months and out-of-order dates', async () => {
    const r = await act.post(`${base}/assumption-sets/history`, csv('p.csv', 'date,Mystery Fund\n2020-01-31,1\n'));
    expect(r.status).toBe(400);
    expect(r.body.issues[0]).toMatchObject({ line: 1, column: 'Mystery Fund' });
    const names = (await act.get(`${base}/funds`)).body.funds.map((f: { name: string }) => f.name);
    const gap = await act.post(`${base}/assumption-sets/history`, csv('p.csv', `date,${names[0]}\n2020-01-31,100\n2020-02-29,101\n2020-05-31,102\n2020-06-30,103\n`));
    expect(gap.body.issues).toEqual([expect.objectContaining({ line: 4, column: 'date', message: expect.stringMatching(/2 month\(s\) are missing/) })]);
  });

  it('accepts only .csv files of a text type and answers 413 above 5 MB', async () => {
    const png = await act.post(`${base}/assumption-sets/history`, csv('chart.png', 'x', 'image/png'));
    expect(png.status).toBe(400);
    expect(paths(png.body)).toEqual(['file']);
    const pdf = await act.post(`${base}/assumption-sets/history`, csv('prices.csv', '%PDF', 'application/pdf'));
    expect(pdf.status).toBe(400);
    const none = await act.post(`${base}/assumption-sets/history`, {});
    expect(none.status).toBe(400);
    expect(paths(none.body)).toEqual(['file']);
    const big = await act.post(`${base}/assumption-sets/history`, csv('big.csv', 'x'.repeat(5 * 1024 * 1024 + 10)));
    expect(big.status).toBe(413);
  });
});

describe('membership upload', () => {
  const header = 'reference,age,salary,pot,contribution_rate,retirement_age';
  const memberLines = (n: number, prefix = 'M') =>
    Array.from({ length: n }, (_, i) => `${prefix}-${String(i + 1).padStart(5, '0')},${20 + (i % 45)},${25000 + (i % 97) * 300},${(i % 50) * 2000},${[0.08, '10%', 0.12][i % 3]},${67}`);
  const count = async () => (await s.db.select({ n: sql<number>`count(*)::int` }).from(schemeMembers).where(eq(schemeMembers.schemeId, s.schemeId)))[0].n;

  it('imports thousands of rows in one go, replacing the previous membership, with one audit event', async () => {
    const before = await auditCount();
    const text = `${header}\n${memberLines(5000).join('\n')}\n`;
    const r = await admin.post(`${base}/membership`, csv('members.csv', text));
    expect(r.status, JSON.stringify(r.body).slice(0, 300)).toBe(201);
    expect(r.body).toMatchObject({ count: 5000, replaced: 40 });
    expect(await count()).toBe(5000);
    expect(await auditCount()).toBe(before + 1);
    const summary = await board.get(`${base}/membership`);
    expect(summary.status).toBe(403); // board may not read membership records
    const sum = await trustee.get(`${base}/membership?limit=5`);
    expect(sum.body.count).toBe(5000);
    expect(sum.body.rows).toHaveLength(5);
    expect(sum.body.rows[1].contributionRate).toBe(0.1);
  });

  it('rejects a file with a bad line 57, lists it with its column and stores nothing', async () => {
    const before = await count();
    const lines = [header, ...memberLines(120, 'N')];
    lines[56] = 'N-00056,71,30000,1000,0.08,67'; // line 57: retirement age below age
    const r = await admin.post(`${base}/membership`, csv('members.csv', `${lines.join('\n')}\n`));
    expect(r.status).toBe(400);
    expect(r.body.issues).toEqual([expect.objectContaining({ line: 57, column: 'retirement_age', message: 'must be above age (71)' })]);
    expect(await count()).toBe(before);
    const refs = await s.db.select({ r: schemeMembers.reference }).from(schemeMembers).where(eq(schemeMembers.reference, 'N-00001'));
    expect(refs).toEqual([]);
  });

  it('lists at most 100 problems but gives the total, and names missing columns', async () => {
    const lines = [header, ...Array.from({ length: 150 }, (_, i) => `X-${i},abc,1,1,0.1,67`)];
    const r = await admin.post(`${base}/membership`, csv('m.csv', lines.join('\n')));
    expect(r.status).toBe(400);
    expect(r.body.issues).toHaveLength(100);
    expect(r.body.message).toMatch(/150 problems.*The first 100 are listed/);
    expect(r.body.issues[0]).toMatchObject({ line: 2, column: 'age' });
    const missing = await admin.post(`${base}/membership`, csv('m.csv', 'reference,age\nA,30\n'));
    expect(missing.body.issues.map((i: { column: string }) => i.column)).toEqual(['salary', 'pot', 'contribution_rate', 'retirement_age']);
    const dup = await admin.post(`${base}/membership`, csv('m.csv', `${header}\nA-1,30,1,1,0.1,67\nA-1,31,1,1,0.1,67\nB-1,30,1,1,8,67\n`));
    expect(dup.body.issues).toEqual([
      expect.objectContaining({ line: 3, column: 'reference', message: '"A-1" repeats line 2' }),
      expect.objectContaining({ line: 4, column: 'contribution_rate' }),
    ]);
  });
});

describe('default options and illustrative members', () => {
  it('rejects weights that do not sum to 1, unknown funds and repeated points, with their paths', async () => {
    const [a, b] = fundIds;
    const r = await trustee.post(`${base}/options`, {
      name: 'Wrong',
      glidePath: [
        { yearsToRetirement: 10, weights: { [a]: 0.6, [b]: 0.3 } },
        { yearsToRetirement: 10, weights: { [a]: 1 } },
      ],
    });
    expect(r.status).toBe(400);
    expect(paths(r.body)).toEqual(expect.arrayContaining(['glidePath.0.weights', 'glidePath.1.yearsToRetirement']));
    expect(r.body.issues.find((i: { path: string }) => i.path === 'glidePath.0.weights').message).toMatch(/sum to 0\.9/);
    const u = await trustee.post(`${base}/options`, { name: 'Unknown', glidePath: [{ yearsToRetirement: 0, weights: { '6f1f8b7e-0000-4000-8000-000000000000': 1 } }] });
    expect(paths(u.body)).toEqual(['glidePath.0.weights.6f1f8b7e-0000-4000-8000-000000000000']);
  });

  it('saves a glide path sorted from far to near retirement and archives the option', async () => {
    const [a, b] = fundIds;
    const c = await trustee.post(`${base}/options`, {
      name: 'Two-step',
      glidePath: [
        { yearsToRetirement: 0, weights: { [b]: 1 } },
        { yearsToRetirement: 20, weights: { [a]: 0.7, [b]: 0.3 } },
      ],
    });
    expect(c.status).toBe(201);
    expect(c.body.glidePath.map((p: { yearsToRetirement: number }) => p.yearsToRetirement)).toEqual([20, 0]);
    expect((await trustee.post(`${base}/options`, { name: 'two-step', glidePath: [{ yearsToRetirement: 0, weights: { [a]: 1 } }] })).status).toBe(409);
    const ar = await trustee.post(`${base}/options/${c.body.id}/archive`, { archived: true });
    expect(ar.body.archived).toBe(true);
    const list = await board.get(`${base}/options`);
    expect(list.body.options.map((o: { name: string }) => o.name)).not.toContain('Two-step');
  });

  it.each([
    ['retirement age not above age', { age: 60, retirementAge: 60 }, 'retirementAge'],
    ['a contribution rate written as a percent', { contributionRate: 8 }, 'contributionRate'],
    ['a negative pot', { pot: -1 }, 'pot'],
    ['a fractional age', { age: 30.5 }, 'age'],
    ['an empty label', { label: '' }, 'label'],
  ])('answers 400 for an illustrative member with %s', async (_n, patch, path) => {
    const r = await trustee.post(`${base}/illustrative-members`, { label: 'Test', age: 30, retirementAge: 67, salary: 30000, salaryGrowth: null, contributionRate: 0.08, pot: 0, ...patch });
    expect(r.status).toBe(400);
    expect(paths(r.body)).toContain(path);
  });

  it('creates, updates and removes an illustrative member, auditing each', async () => {
    const c = await act.post(`${base}/illustrative-members`, { label: 'Part-time', age: 38, retirementAge: 68, salary: 18000, salaryGrowth: 0.02, contributionRate: 0.08, pot: 9000 });
    expect(c.status).toBe(201);
    const u = await trustee.put(`${base}/illustrative-members/${c.body.id}`, { label: 'Part-time', age: 38, retirementAge: 68, salary: 19000, salaryGrowth: null, contributionRate: 0.08, pot: 9000 });
    expect(u.body).toMatchObject({ salary: 19000, salaryGrowth: null });
    expect((await act.delete(`${base}/illustrative-members/${c.body.id}`)).status).toBe(200);
    const events = await s.db.select({ action: auditEvents.action }).from(auditEvents).where(eq(auditEvents.entityId, c.body.id));
    expect(events.map((e) => e.action).sort()).toEqual(['illustrative-member.created', 'illustrative-member.removed', 'illustrative-member.updated']);
  });
});
