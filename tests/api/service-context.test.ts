import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, desc, eq } from 'drizzle-orm';
import { auditEvents, users } from '../../db/schema';
import { systemContext, type ServiceContext } from '../../server/services/context';
import { createFund, deleteFund } from '../../server/services/funds';
import { createIllustrative } from '../../server/services/members';
import { createOption, setArchived } from '../../server/services/options';
import { approve, copyToDraft, latestApproved } from '../../server/services/assumptions';
import { startTestServer, type TestServer } from '../helpers/app';

let s: TestServer;
let actuary: ServiceContext;
let trustee: ServiceContext;

beforeAll(async () => {
  s = await startTestServer();
  const person = async (email: string) => {
    const [u] = await s.db.select().from(users).where(eq(users.email, email));
    return { id: u.id, email: u.email, displayName: u.displayName };
  };
  actuary = { schemeId: s.schemeId, actor: await person('actuary@fernleigh.example'), ip: '192.0.2.7' };
  trustee = { schemeId: s.schemeId, actor: await person('trustee@fernleigh.example') };
});
afterAll(async () => s?.close());

const lastAudit = async (action: string) => {
  const [row] = await s.db
    .select()
    .from(auditEvents)
    .where(and(eq(auditEvents.schemeId, s.schemeId), eq(auditEvents.action, action)))
    .orderBy(desc(auditEvents.id))
    .limit(1);
  return row;
};

describe('services called without a request', () => {
  it('a job (no actor) creates and removes a fund, and the trail records the system as actor', async () => {
    const fund = await createFund(s.db, systemContext(s.schemeId), { name: 'Made by a job', assetClass: '' });
    const created = await lastAudit('fund.created');
    expect(created.entityId).toBe(fund.id);
    expect(created.userId).toBeNull();
    expect(created.actorEmail).toBeNull();
    await deleteFund(s.db, systemContext(s.schemeId), fund.id);
    expect((await lastAudit('fund.removed')).entityId).toBe(fund.id);
  });

  it('a named actor’s context carries who and where into the trail', async () => {
    const m = await createIllustrative(s.db, actuary, { label: 'Context test member', age: 40, retirementAge: 67, salary: 30_000, salaryGrowth: null, contributionRate: 0.08, pot: 10_000 });
    const row = await lastAudit('illustrative-member.created');
    expect(row.entityId).toBe(m.id);
    expect(row.actorEmail).toBe('actuary@fernleigh.example');
    expect(row.ip).toBe('192.0.2.7');
  });

  it('drafts, approves and archives through plain contexts, recording each actor', async () => {
    const current = (await latestApproved(s.db, s.schemeId))!;
    const draft = await copyToDraft(s.db, actuary, current.id);
    expect(draft.createdBy).toBe(actuary.actor!.displayName);
    const approved = await approve(s.db, trustee, draft.id);
    expect(approved.status).toBe('approved');
    expect(approved.approvedBy).toBe(trustee.actor!.displayName);
    const option = await createOption(s.db, trustee, { name: 'Context test option', description: '', glidePath: [{ yearsToRetirement: 0, weights: { [current.funds[0].fundId]: 1 } }] });
    const archived = await setArchived(s.db, trustee, option.id, true);
    expect(archived.archived).toBe(true);
    expect((await lastAudit('option.archived')).actorEmail).toBe('trustee@fernleigh.example');
  });

  it('refuses a scheme-level action whose context names no scheme', async () => {
    await expect(createFund(s.db, systemContext(null), { name: 'Nowhere', assetClass: '' })).rejects.toThrow(/names none/);
  });
});
