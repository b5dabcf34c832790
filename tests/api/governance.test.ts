import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { assumptionSets, projectionRuns, runOptionVersions, schemeSettings } from '../../db/schema';
import { DEMO_SECOND_TRUSTEE } from '../../db/seed';
import { Client, startTestServer, type TestServer } from '../helpers/app';
import { schemeOptions } from '../helpers/options';
import { insertFinishedRun } from './route-examples/reports';
import { download, pdfText } from './reports-helpers';

let s: TestServer;
let trustee: Client;
let trustee2: Client;
let actuary: Client;
let admin: Client;
let board: Client;
let fundIds: string[];
const S = () => `/schemes/${s.schemeId}`;

beforeAll(async () => {
  s = await startTestServer();
  const signed = async (email: string) => {
    const c = new Client(s.baseUrl);
    await c.signIn(email);
    return c;
  };
  trustee = await signed('trustee@fernleigh.example');
  trustee2 = await signed(DEMO_SECOND_TRUSTEE.email);
  actuary = await signed('actuary@fernleigh.example');
  admin = await signed('admin@fernleigh.example');
  board = await signed('board@fernleigh.example');
  fundIds = (await actuary.get(`${S()}/funds`)).body.funds.map((f: { id: string }) => f.id);
});
afterAll(async () => s?.close());

const glide = (equity: number) => [
  { yearsToRetirement: 20, weights: { [fundIds[0]]: 1 } },
  { yearsToRetirement: 0, weights: { [fundIds[0]]: equity, [fundIds[1]]: 1 - equity } },
];

async function setApprovalsRequired(n: 1 | 2) {
  const current = (await admin.get(`${S()}/settings`)).body;
  const r = await admin.put(`${S()}/settings`, { approvalsRequired: n, signOffQuorum: current.signOffQuorum, reviewIntervalYears: current.reviewIntervalYears, nextReviewDue: current.nextReviewDue });
  expect(r.status, JSON.stringify(r.body)).toBe(200);
}

describe('versioned default options', () => {
  it('starts a new option as a draft, refuses its editor’s own approval (403) and takes a second trustee’s', async () => {
    const created = await trustee.post(`${S()}/options`, { name: 'Steady lifecycle', description: 'A test option', glidePath: glide(0.6) });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    expect(created.body.latest).toMatchObject({ version: 1, status: 'draft' });
    expect(created.body.approved).toBeNull();
    const v1 = created.body.latest.id;

    const own = await trustee.post(`${S()}/options/${created.body.id}/versions/${v1}/approve`);
    expect(own.status).toBe(403);
    expect(own.body.message).toMatch(/You made the last change to Steady lifecycle v1, so another trustee must approve it/);

    const other = await trustee2.post(`${S()}/options/${created.body.id}/versions/${v1}/approve`);
    expect(other.status, JSON.stringify(other.body)).toBe(200);
    expect(other.body).toMatchObject({ status: 'approved', approvedBy: 'Ninian Castellow', approvals: [expect.objectContaining({ name: 'Ninian Castellow' })] });
    expect((await trustee2.post(`${S()}/options/${created.body.id}/versions/${v1}/approve`)).status).toBe(409);
  });

  it('turns an edit of an approved option into a new draft version, keeping the old one readable and comparable', async () => {
    const created = (await trustee.post(`${S()}/options`, { name: 'Glide to bonds', description: '', glidePath: glide(0.5) })).body;
    await trustee2.post(`${S()}/options/${created.id}/versions/${created.latest.id}/approve`);
    const edited = await trustee.put(`${S()}/options/${created.id}`, { name: 'Glide to bonds', description: 'Less equity at the end', glidePath: glide(0.3) });
    expect(edited.status, JSON.stringify(edited.body)).toBe(200);
    expect(edited.body.versions.map((v: { version: number; status: string }) => `${v.version}:${v.status}`)).toEqual(['2:draft', '1:approved']);
    expect(edited.body.approved.version).toBe(1);
    const [v2, v1] = edited.body.versions;

    const old = await board.get(`${S()}/options/${created.id}/versions/${v1.id}`);
    expect(old.status).toBe(200);
    expect(old.body.glidePath[1].weights[fundIds[0]]).toBe(0.5);
    const cmp = await board.get(`${S()}/options/${created.id}/versions/${v1.id}/compare/${v2.id}`);
    expect(cmp.status).toBe(200);
    expect(cmp.body.changed).toEqual({ name: false, description: true, glidePath: true });
    expect(cmp.body.years).toEqual([20, 0]);
    expect(cmp.body.b.basedOnVersion).toBe(1);

    // Editing the pending draft changes it in place; saving the approved content again is refused.
    const again = await trustee.put(`${S()}/options/${created.id}`, { name: 'Glide to bonds', description: 'Less equity at the end', glidePath: glide(0.25) });
    expect(again.body.versions).toHaveLength(2);
    expect((await trustee.delete(`${S()}/options/${created.id}/versions/${v1.id}`)).status).toBe(409);
    expect((await trustee.delete(`${S()}/options/${created.id}/versions/${v2.id}`)).status).toBe(200);
    const same = await trustee.put(`${S()}/options/${created.id}`, { name: 'Glide to bonds', description: '', glidePath: glide(0.5) });
    expect(same.status).toBe(409);
    // The same content with the funds written in the other order is the same content (the database keeps its own key order).
    const reordered = glide(0.5).map((p) => ({ ...p, weights: Object.fromEntries(Object.entries(p.weights).reverse()) }));
    expect((await trustee.put(`${S()}/options/${created.id}`, { name: 'Glide to bonds', description: '', glidePath: reordered })).status).toBe(409);
  });

  it('records the option versions a run used, in its snapshot and in run_option_versions, and can run a draft on request', async () => {
    const set = (await trustee.get(`${S()}/assumption-sets`)).body.sets.find((x: { status: string }) => x.status === 'approved');
    const o = (await trustee.post(`${S()}/options`, { name: 'Run me', description: '', glidePath: glide(0.7) })).body;
    await trustee2.post(`${S()}/options/${o.id}/versions/${o.latest.id}/approve`);
    const draft = (await trustee.put(`${S()}/options/${o.id}`, { name: 'Run me', description: 'revised', glidePath: glide(0.4) })).body.latest;
    const members = (await trustee.get(`${S()}/illustrative-members`)).body.members.slice(0, 1).map((m: { id: string }) => m.id);

    const approvedRun = await trustee.post(`${S()}/runs`, { assumptionSetId: set.id, optionIds: [o.id], memberIds: members, paths: 100, seed: 5 });
    expect(approvedRun.status, JSON.stringify(approvedRun.body)).toBe(201);
    expect(approvedRun.body.options).toEqual([{ id: o.id, name: 'Run me', versionId: o.latest.id, version: 1, status: 'approved' }]);
    const draftRun = await trustee.post(`${S()}/runs`, { assumptionSetId: set.id, optionIds: [o.id], optionVersions: { [o.id]: draft.id }, memberIds: members, paths: 100, seed: 5 });
    expect(draftRun.body.options[0]).toMatchObject({ versionId: draft.id, version: 2, status: 'draft' });
    const rows = await s.db.select().from(runOptionVersions).where(eq(runOptionVersions.runId, draftRun.body.id));
    expect(rows).toEqual([{ runId: draftRun.body.id, position: 0, optionId: o.id, optionVersionId: draft.id }]);
    const [stored] = await s.db.select().from(projectionRuns).where(eq(projectionRuns.id, draftRun.body.id));
    expect((stored.input as { scenario: { options: { glidePath: unknown }[] } }).scenario.options[0].glidePath).toEqual(glide(0.4));

    const wrong = await trustee.post(`${S()}/runs`, { assumptionSetId: set.id, optionIds: [o.id], optionVersions: { [o.id]: set.id }, memberIds: members, paths: 100 });
    expect(wrong.status).toBe(400);
    expect(wrong.body.issues).toEqual([{ path: `optionVersions.${o.id}`, message: 'is not a version of this option' }]);
  });
});

describe('four-eyes approval of assumption sets', () => {
  async function draftSet() {
    const sets = (await actuary.get(`${S()}/assumption-sets`)).body.sets;
    const r = await actuary.post(`${S()}/assumption-sets/${sets.find((x: { status: string }) => x.status === 'approved').id}/drafts`);
    expect(r.status).toBe(201);
    return r.body;
  }

  it('with a two-approval setting, leaves the set a draft after one approval and approves it after a second trustee’s', async () => {
    await setApprovalsRequired(2);
    try {
      const d = await draftSet();
      const first = await trustee.post(`${S()}/assumption-sets/${d.id}/approve`);
      expect(first.status, JSON.stringify(first.body)).toBe(200);
      expect(first.body).toMatchObject({ status: 'draft', approvalsRequired: 2, approvals: [expect.objectContaining({ name: 'Idris Pellow' })] });
      expect((await trustee.post(`${S()}/assumption-sets/${d.id}/approve`)).status).toBe(409);
      const second = await trustee2.post(`${S()}/assumption-sets/${d.id}/approve`);
      expect(second.body).toMatchObject({ status: 'approved', approvedBy: 'Ninian Castellow' });
      expect(second.body.approvals.map((a: { name: string }) => a.name)).toEqual(['Idris Pellow', 'Ninian Castellow']);
    } finally {
      await setApprovalsRequired(1);
    }
  });

  it('withdraws an approval when the draft is edited after it', async () => {
    await setApprovalsRequired(2);
    try {
      const d = await draftSet();
      expect((await trustee.post(`${S()}/assumption-sets/${d.id}/approve`)).body.approvals).toHaveLength(1);
      const content = { setAt: d.setAt, rationale: 'Revised after one approval', inflation: 0.026, salaryGrowth: d.salaryGrowth, annuityRealRate: d.annuityRealRate, annuityYears: d.annuityYears, funds: d.funds.map(({ fundId, expectedReturn, volatility, annualCharge }: Record<string, number>) => ({ fundId, expectedReturn, volatility, annualCharge })), correlations: d.correlations };
      const edited = await actuary.put(`${S()}/assumption-sets/${d.id}`, content);
      expect(edited.status, JSON.stringify(edited.body)).toBe(200);
      expect(edited.body.approvals).toEqual([]);
      const after = await trustee2.post(`${S()}/assumption-sets/${d.id}/approve`);
      expect(after.body).toMatchObject({ status: 'draft', approvals: [expect.objectContaining({ name: 'Ninian Castellow' })] });
    } finally {
      await setApprovalsRequired(1);
    }
  });

  it('refuses a trustee who last edited the set (403)', async () => {
    const d = await draftSet();
    const me = (await trustee.get('/auth/me')).body.user;
    await s.db.update(assumptionSets).set({ updatedBy: me.id }).where(eq(assumptionSets.id, d.id));
    const r = await trustee.post(`${S()}/assumption-sets/${d.id}/approve`);
    expect(r.status).toBe(403);
    expect(r.body.message).toContain(`You made the last change to assumption set v${d.version}`);
    expect((await trustee2.post(`${S()}/assumption-sets/${d.id}/approve`)).body.status).toBe('approved');
  });
});

describe('scheme settings and the current default', () => {
  it('lets the administrator change the settings, no one else, and refuses a quorum larger than the board', async () => {
    const body = { approvalsRequired: 1, signOffQuorum: 2, reviewIntervalYears: 3, nextReviewDue: '2027-03-31' };
    expect((await trustee.put(`${S()}/settings`, body)).status).toBe(403);
    const tooMany = await admin.put(`${S()}/settings`, { ...body, signOffQuorum: 5 });
    expect(tooMany.status).toBe(400);
    expect(tooMany.body.issues).toEqual([{ path: 'signOffQuorum', message: 'must be at most 2: the scheme has 2 trustees to sign' }]);
    const ok = await admin.put(`${S()}/settings`, body);
    expect(ok.body).toMatchObject({ ...body, trustees: 2, updatedBy: 'Morag Tennant' });
    expect((await board.get(`${S()}/settings`)).body.signOffQuorum).toBe(2);
  });

  it('marks the current default, shows it on the overview and records it on runs as their baseline', async () => {
    const options = await schemeOptions(s.db, s.schemeId);
    const cautious = options.find((o) => o.name === 'Cautious glide')!;
    const overview0 = (await trustee.get(`${S()}/overview`)).body;
    expect(overview0.governance.currentDefault.name).toBe('Balanced lifecycle');
    const r = await trustee.put(`${S()}/current-default`, { optionId: cautious.id });
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    const overview = (await board.get(`${S()}/overview`)).body;
    expect(overview.governance.currentDefault).toMatchObject({ optionId: cautious.id, name: 'Cautious glide', version: 1 });
    const list = (await board.get(`${S()}/options`)).body.options;
    expect(list.filter((o: { isCurrentDefault: boolean }) => o.isCurrentDefault).map((o: { name: string }) => o.name)).toEqual(['Cautious glide']);

    const set = (await trustee.get(`${S()}/assumption-sets`)).body.sets.find((x: { status: string }) => x.status === 'approved');
    const run = await trustee.post(`${S()}/runs`, { assumptionSetId: set.id, optionIds: options.slice(0, 2).map((o) => o.id), memberIds: [(await trustee.get(`${S()}/illustrative-members`)).body.members[0].id], paths: 100 });
    expect(run.body.baselineOptionId).toBe(cautious.id);
    expect((await trustee.post(`${S()}/options/${cautious.id}/archive`, { archived: true })).status).toBe(409);
    expect((await board.put(`${S()}/current-default`, { optionId: cautious.id })).status).toBe(403);
    const draftOnly = (await trustee.post(`${S()}/options`, { name: 'Never approved', description: '', glidePath: glide(0.5) })).body;
    expect((await trustee.put(`${S()}/current-default`, { optionId: draftOnly.id })).status).toBe(409);
  });
});

describe('a review from opening to a signed, immutable decision record', () => {
  it('gathers the evidence, needs the quorum, then refuses every change with 409 and exports the decision record', async () => {
    const { run, options, set } = await insertFinishedRun(s.db, s.schemeId, { paths: 300, seed: 4242, tag: 'review' });
    const opened = await trustee.post(`${S()}/reviews`, { title: 'Default review 2027' });
    expect(opened.status, JSON.stringify(opened.body)).toBe(201);
    const id = opened.body.id;
    expect(opened.body.status).toBe('open');
    expect(opened.body.assumptionSet.status).toBe('approved');
    expect(opened.body.optionVersions.length).toBeGreaterThanOrEqual(4);
    expect(opened.body.missing).toEqual(expect.arrayContaining(['add at least one finished projection run', 'record the decision: an option chosen, or no change']));

    // Not ready: signing answers 409 naming what is missing.
    const early = await trustee.post(`${S()}/reviews/${id}/sign-off`);
    expect(early.status).toBe(409);
    expect(early.body.message).toMatch(/not ready to sign: .*add at least one finished projection run/);

    // A draft option version cannot be part of a review.
    const draftOpt = (await trustee.post(`${S()}/options`, { name: 'Draft for review', description: '', glidePath: glide(0.5) })).body;
    const bad = await trustee.patch(`${S()}/reviews/${id}`, { optionVersionIds: [draftOpt.latest.id] });
    expect(bad.status).toBe(400);
    expect(bad.body.issues[0]).toMatchObject({ path: 'optionVersionIds.0' });

    const filled = await trustee.patch(`${S()}/reviews/${id}`, {
      assumptionSetId: set.id,
      optionVersionIds: options.map((o) => o.versionId),
      runIds: [run.id],
      decision: 'option',
      chosenVersionId: options[1].versionId,
      riskAversion: 3,
      lambdaCalibration: 'Each trustee chose between sure and uncertain pots; the median answer was λ = 3.',
      reasons: 'The glide to bonds protects members close to retirement at little cost to the median pot.',
      dissent: 'One trustee preferred to keep more equity until retirement.',
    });
    expect(filled.status, JSON.stringify(filled.body)).toBe(200);
    expect(filled.body.missing).toEqual([]);
    expect(filled.body.decisionSentence).toBe(`The trustees chose ${options[1].name} (version 1) as the scheme's default option.`);

    // The first signature leaves it open; a change withdraws it; the quorum (2) makes it final.
    const one = await trustee.post(`${S()}/reviews/${id}/sign-off`);
    expect(one.body).toMatchObject({ status: 'open', signOffs: [expect.objectContaining({ name: 'Idris Pellow' })], quorum: 2 });
    expect((await trustee.post(`${S()}/reviews/${id}/sign-off`)).status).toBe(409);
    const changed = await trustee2.patch(`${S()}/reviews/${id}`, { reasons: 'The glide to bonds protects members close to retirement at little cost to the median pot, in the board’s view.' });
    expect(changed.body.signOffs).toEqual([]);
    expect((await board.post(`${S()}/reviews/${id}/sign-off`)).status).toBe(403);
    await trustee.post(`${S()}/reviews/${id}/sign-off`);
    const final = await trustee2.post(`${S()}/reviews/${id}/sign-off`);
    expect(final.status, JSON.stringify(final.body)).toBe(200);
    expect(final.body.status).toBe('signed_off');
    const expectedDue = new Date(final.body.signedOffAt);
    expectedDue.setUTCFullYear(expectedDue.getUTCFullYear() + 3);
    expect(final.body.nextReviewDue).toBe(expectedDue.toISOString().slice(0, 10));

    // The scheme now knows the next review date and the chosen option is its current default.
    const [settings] = await s.db.select().from(schemeSettings).where(eq(schemeSettings.schemeId, s.schemeId));
    expect(settings.nextReviewDue).toBe(final.body.nextReviewDue);
    expect(settings.currentDefaultOptionId).toBe(options[1].id);
    expect((await board.get(`${S()}/overview`)).body.governance).toMatchObject({ nextReviewDue: final.body.nextReviewDue, lastReview: { id, title: 'Default review 2027' } });

    // Immutable: every change answers 409.
    const refusals = [
      await trustee.patch(`${S()}/reviews/${id}`, { dissent: 'Changed afterwards' }),
      await trustee.patch(`${S()}/reviews/${id}`, { runIds: [] }),
      await trustee.delete(`${S()}/reviews/${id}`),
      await trustee.post(`${S()}/reviews/${id}/sign-off`),
      await trustee2.delete(`${S()}/reviews/${id}/sign-off`),
    ];
    expect(refusals.map((r) => r.status)).toEqual([409, 409, 409, 409, 409]);
    expect(refusals[0].body.message).toMatch(/"Default review 2027" was signed off on \d{1,2} [A-Z][a-z]+ \d{4} and can no longer change/);
    expect((await board.get(`${S()}/reviews/${id}`)).body.dissent).toBe('One trustee preferred to keep more equity until retirement.');

    // The decision record: the decision, the sign-offs and the run with its seed and engine version.
    const pdf = await download(board, `${S()}/reviews/${id}/record.pdf`);
    expect(pdf.status).toBe(200);
    expect(pdf.type).toBe('application/pdf');
    expect(pdf.disposition).toContain('default-review-2027-decision-record.pdf');
    const { text } = await pdfText(pdf.body);
    expect(text).toContain('Default review 2027');
    expect(text).toContain(`The trustees chose ${options[1].name} (version 1) as the scheme's default option.`);
    expect(text).toContain('Idris Pellow');
    expect(text).toContain('Ninian Castellow');
    expect(text).toContain(`Run ${run.id}`);
    expect(text).toContain('seed 4242');
    expect(text).toContain(`engine ${run.engineVersion}`);
    expect(text).toContain('the median answer was λ = 3');
    expect(text).toContain('One trustee preferred to keep more equity');
    expect(text).not.toContain('DRAFT');
    // Kept as signed: the same bytes every time.
    expect((await download(trustee, `${S()}/reviews/${id}/record.pdf`)).body.equals(pdf.body)).toBe(true);
  });

  it('records "no change" and draws a draft record, marked DRAFT, while the review is open', async () => {
    const opened = (await trustee.post(`${S()}/reviews`, { title: 'Interim check' })).body;
    await trustee.patch(`${S()}/reviews/${opened.id}`, { decision: 'no_change', riskAversion: 2 });
    const pdf = await download(admin, `${S()}/reviews/${opened.id}/record.pdf`);
    expect(pdf.disposition).toContain('interim-check-decision-record-draft.pdf');
    const { text } = await pdfText(pdf.body);
    expect(text).toContain('DRAFT');
    expect(text).toMatch(/The trustees decided to make no change to the default option/);
    expect((await trustee.delete(`${S()}/reviews/${opened.id}`)).status).toBe(200);
    expect((await trustee.get(`${S()}/reviews/${opened.id}`)).status).toBe(404);
  });

  it('lists reviews with their signatures, to every role that reads them', async () => {
    const r = await board.get(`${S()}/reviews`);
    expect(r.status).toBe(200);
    expect(r.body.reviews.find((x: { title: string }) => x.title === 'Default review 2027')).toMatchObject({ status: 'signed_off', signatures: 2, quorum: 2 });
    const comms = new Client(s.baseUrl);
    await comms.signIn('comms@fernleigh.example');
    expect((await comms.get(`${S()}/reviews`)).status).toBe(403);
  });
});

describe('the activity log in words', () => {
  it('tells the administrator who did what to which object, with a link, in sentences', async () => {
    const log = await admin.get(`${S()}/activity?limit=200`);
    expect(log.status).toBe(200);
    const sentences = log.body.events.map((e: { sentence: string }) => e.sentence);
    expect(sentences).toContain('Ninian Castellow approved Steady lifecycle v1');
    expect(sentences).toContain('Idris Pellow created the default option Steady lifecycle v1 as a draft');
    expect(sentences).toContain('Ninian Castellow signed off the review “Default review 2027”, completing the quorum');
    expect(sentences).toContain('Morag Tennant changed the scheme’s governance settings');
    const approved = log.body.events.find((e: { sentence: string }) => e.sentence === 'Ninian Castellow approved Steady lifecycle v1');
    expect(approved.href).toMatch(/^\/options\/[0-9a-f-]{36}\?version=[0-9a-f-]{36}$/);
    for (const e of log.body.events as { sentence: string; details: string[] }[]) {
      for (const t of [e.sentence, ...e.details]) expect(t, 'no raw JSON in the words').not.toMatch(/[{}]|"[a-zA-Z]+":/);
      expect(e.sentence, 'no "Someone"').not.toMatch(/^Someone /);
    }
  });
});
