import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client, startTestServer, type TestServer } from '../helpers/app';

let s: TestServer;
beforeAll(async () => {
  s = await startTestServer();
});
afterAll(async () => s?.close());

async function overviewAs(email: string) {
  const c = new Client(s.baseUrl);
  await c.signIn(email);
  const r = await c.get(`/schemes/${s.schemeId}/overview`);
  expect(r.status).toBe(200);
  return r.body;
}

describe('scheme overview', () => {
  it('gives a trustee the demo scheme at a glance: counts, the approved assumptions and its approver', async () => {
    const o = await overviewAs('trustee@fernleigh.example');
    expect(o.counts).toEqual({ funds: 5, options: 4, illustrativeMembers: 3, schemeMembers: 40 });
    expect(o.assumptions.latestApproved).toMatchObject({ version: 1, setAt: '2026-09-30', approvedBy: 'Idris Pellow' });
    expect(o.assumptions.drafts).toEqual([]);
    expect(o.runs).toEqual([]);
    expect(o.reports).toEqual([]);
  });

  it('leaves out what a role may not read', async () => {
    const board = await overviewAs('board@fernleigh.example');
    expect(board.counts.illustrativeMembers).toBeNull();
    expect(board.runs).toEqual([]);
    const admin = await overviewAs('admin@fernleigh.example');
    expect(admin.runs).toBeNull();
    expect(admin.reports).toBeNull();
    const comms = await overviewAs('comms@fernleigh.example');
    expect(comms.assumptions).toBeNull();
    expect(comms.reports).toBeNull();
  });
});
