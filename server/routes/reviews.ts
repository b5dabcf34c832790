import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../context';
import { defineRoute } from '../routing';
import { contextOf } from '../services/context';
import { settingsView, updateSettings } from '../services/governance';
import { decisionRecordPdf, discardReview, getReview, listReviews, openReview, signOff, updateReview, withdrawSignature } from '../services/reviews';
import { sendFile } from './reports';

const Id = z.uuid('is not a valid id');
const ReviewId = z.object({ reviewId: Id });
const Title = z.string('must be text').trim().min(1, 'must not be empty').max(200, 'must be at most 200 characters');
const LongText = z.string('must be text').trim().max(6000, 'must be at most 6,000 characters');
const IsoDate = z.iso.date('must be a date written YYYY-MM-DD');
const uniqueIds = (what: string) =>
  z
    .array(Id)
    .max(50, `at most 50 ${what}`)
    .superRefine((ids, c) => {
      if (new Set(ids).size !== ids.length) c.addIssue({ code: 'custom', message: `names the same ${what.replace(/s$/, '')} twice` });
    });

export const OpenReviewBody = z.strictObject({ title: Title });

/** Any subset of a review's fields; lists replace the review's list. */
export const ReviewPatchBody = z
  .strictObject({
    title: Title,
    assumptionSetId: Id.nullable(),
    optionVersionIds: uniqueIds('option versions'),
    runIds: uniqueIds('runs'),
    reportIds: uniqueIds('reports'),
    decision: z.enum(['option', 'no_change'], 'must be "option" or "no_change"').nullable(),
    chosenVersionId: Id.nullable(),
    riskAversion: z.number('must be a number').min(-5, 'must be at least -5').max(50, 'must be at most 50').nullable(),
    lambdaCalibration: LongText,
    reasons: LongText,
    dissent: LongText,
    nextReviewDue: IsoDate.nullable(),
  })
  .partial();

export const SettingsBody = z.strictObject({
  approvalsRequired: z.number('must be a number').int('must be 1 or 2').min(1, 'must be 1 or 2').max(2, 'must be 1 or 2'),
  signOffQuorum: z.number('must be a number').int('must be a whole number').min(1, 'must be at least 1').max(12, 'must be at most 12'),
  reviewIntervalYears: z.number('must be a number').int('must be a whole number of years').min(1, 'must be at least 1').max(5, 'must be at most 5 (reviews are due at least every three years in common practice)'),
  nextReviewDue: IsoDate.nullable(),
});

/** Governance: the scheme's settings, and reviews of the default option from opening to the signed decision record. */
export function reviewsRouter(ctx: AppContext): Router {
  const r = Router({ mergeParams: true });
  const M = '/schemes/:schemeId';

  defineRoute(r, M, { method: 'get', path: '/settings', access: 'settings:read' }, async (req, res) => {
    res.json(await settingsView(ctx.db, req.scheme!.id));
  });

  defineRoute(r, M, { method: 'put', path: '/settings', access: 'settings:edit' }, async (req, res) => {
    res.json(await updateSettings(ctx.db, contextOf(req), SettingsBody.parse(req.body)));
  });

  defineRoute(r, M, { method: 'get', path: '/reviews', access: 'reviews:read' }, async (req, res) => {
    res.json({ reviews: await listReviews(ctx.db, req.scheme!.id) });
  });

  defineRoute(r, M, { method: 'post', path: '/reviews', access: 'reviews:edit' }, async (req, res) => {
    res.status(201).json(await openReview(ctx.db, contextOf(req), OpenReviewBody.parse(req.body)));
  });

  defineRoute(r, M, { method: 'get', path: '/reviews/:reviewId', access: 'reviews:read' }, async (req, res) => {
    res.json(await getReview(ctx.db, req.scheme!.id, ReviewId.parse(req.params).reviewId));
  });

  defineRoute(r, M, { method: 'patch', path: '/reviews/:reviewId', access: 'reviews:edit' }, async (req, res) => {
    const { reviewId } = ReviewId.parse(req.params);
    res.json(await updateReview(ctx.db, contextOf(req), reviewId, ReviewPatchBody.parse(req.body)));
  });

  defineRoute(r, M, { method: 'delete', path: '/reviews/:reviewId', access: 'reviews:edit' }, async (req, res) => {
    await discardReview(ctx.db, contextOf(req), ReviewId.parse(req.params).reviewId);
    res.json({ ok: true });
  });

  defineRoute(r, M, { method: 'post', path: '/reviews/:reviewId/sign-off', access: 'reviews:sign' }, async (req, res) => {
    res.json(await signOff(ctx.db, contextOf(req), ReviewId.parse(req.params).reviewId));
  });

  defineRoute(r, M, { method: 'delete', path: '/reviews/:reviewId/sign-off', access: 'reviews:sign' }, async (req, res) => {
    res.json(await withdrawSignature(ctx.db, contextOf(req), ReviewId.parse(req.params).reviewId));
  });

  defineRoute(r, M, { method: 'get', path: '/reviews/:reviewId/record.pdf', access: 'reviews:read' }, async (req, res) => {
    const file = await decisionRecordPdf(ctx.db, req.scheme!.id, ReviewId.parse(req.params).reviewId);
    sendFile(res, file, 'application/pdf', req.query.inline === '1');
  });

  return r;
}
