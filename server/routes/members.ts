import { Router } from 'express';
import { createInsertSchema } from 'drizzle-zod';
import { z } from 'zod';
import type { AppContext } from '../context';
import { defineRoute } from '../routing';
import { contextOf } from '../services/context';
import { illustrativeMembers } from '../../db/schema';
import { MemberSchema } from '../../simulation';
import { csvUpload } from '../uploads';
import { createIllustrative, deleteIllustrative, listIllustrative, updateIllustrative } from '../services/members';
import { membershipSummary, replaceMembership } from '../services/membership';
import { parseMembershipCsvOffThread } from '../threads';

const M_ = MemberSchema.shape;

/** An illustrative member; limits are the engine's own (simulation/schema.ts). */
export const IllustrativeBody = createInsertSchema(illustrativeMembers)
  .pick({ label: true, age: true, retirementAge: true, salary: true, salaryGrowth: true, contributionRate: true, pot: true })
  .extend({
    label: z.string().trim().min(1, 'must not be empty').max(120, 'must be at most 120 characters'),
    age: M_.age.min(16, 'must be at least 16'),
    retirementAge: M_.retirementAge.max(80, 'must be at most 80'),
    // Money is bounded like the membership upload's (a salary of 1e300 would overflow the projection).
    salary: M_.salary.max(10_000_000, 'is implausibly large (over 10,000,000)'),
    salaryGrowth: M_.salaryGrowth.nullable().default(null),
    contributionRate: M_.contributionRate,
    pot: M_.pot.max(100_000_000, 'is implausibly large (over 100,000,000)'),
  })
  .strict()
  .superRefine((m, ctx) => {
    if (m.retirementAge <= m.age) ctx.addIssue({ code: 'custom', path: ['retirementAge'], message: `must be above age (${m.age}); got ${m.retirementAge}` });
  });

const MemberId = z.object({ memberId: z.uuid('is not a valid id') });
const Page = z.object({ offset: z.coerce.number().int().min(0).default(0), limit: z.coerce.number().int().min(1).max(500).default(50) });

/** Illustrative members (trustees and actuary) and the uploaded membership (administrator and actuary). */
export function membersRouter(ctx: AppContext): Router {
  const r = Router({ mergeParams: true });
  const I = '/schemes/:schemeId/illustrative-members';
  const S = '/schemes/:schemeId/membership';

  defineRoute(r, I, { method: 'get', path: '', access: 'members:read' }, async (req, res) => {
    res.json({ members: await listIllustrative(ctx.db, req.scheme!.id) });
  });

  defineRoute(r, I, { method: 'post', path: '', access: 'members:edit' }, async (req, res) => {
    res.status(201).json(await createIllustrative(ctx.db, contextOf(req), IllustrativeBody.parse(req.body)));
  });

  defineRoute(r, I, { method: 'put', path: '/:memberId', access: 'members:edit' }, async (req, res) => {
    const { memberId } = MemberId.parse(req.params);
    res.json(await updateIllustrative(ctx.db, contextOf(req), memberId, IllustrativeBody.parse(req.body)));
  });

  defineRoute(r, I, { method: 'delete', path: '/:memberId', access: 'members:edit' }, async (req, res) => {
    const { memberId } = MemberId.parse(req.params);
    await deleteIllustrative(ctx.db, contextOf(req), memberId);
    res.json({ ok: true });
  });

  defineRoute(r, S, { method: 'get', path: '', access: 'members:read' }, async (req, res) => {
    res.json(await membershipSummary(ctx.db, req.scheme!.id, Page.parse(req.query)));
  });

  // Replace-all: the uploaded file becomes the whole membership, or nothing changes.
  defineRoute(r, S, { method: 'post', path: '', access: 'membership:upload' }, csvUpload('file'), async (req, res) => {
    // Parsed on a worker thread: a large file takes seconds, which the API's event loop must not wait for.
    const rows = await parseMembershipCsvOffThread(req.file!.buffer);
    res.status(201).json(await replaceMembership(ctx.db, contextOf(req), rows, { name: req.file!.originalname, buffer: req.file!.buffer }));
  });

  return r;
}
