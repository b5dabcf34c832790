import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../context';
import { defineRoute } from '../routing';
import { contextOf } from '../services/context';
import { AssumptionSetBody } from '../../schemas/assumptions';
import { csvUpload } from '../uploads';
import { suggestionForScheme } from '../services/history';
import { approve, compareVersions, copyToDraft, createDraft, deleteDraft, getSet, listSets, updateDraft } from '../services/assumptions';

// The request body is shared with the assumption-set form (schemas/assumptions.ts).

const SetId = z.object({ setId: z.uuid('is not a valid id') });
const Pair = z.object({ setId: z.uuid('is not a valid id'), otherId: z.uuid('is not a valid id') });

/** Versioned capital-market assumptions: drafts kept by the actuary, approved by a trustee. */
export function assumptionsRouter(ctx: AppContext): Router {
  const r = Router({ mergeParams: true });
  const M = '/schemes/:schemeId/assumption-sets';

  defineRoute(r, M, { method: 'get', path: '', access: 'assumptions:read' }, async (req, res) => {
    res.json({ sets: await listSets(ctx.db, req.scheme!.id) });
  });

  defineRoute(r, M, { method: 'post', path: '', access: 'assumptions:edit' }, async (req, res) => {
    const body = AssumptionSetBody.parse(req.body);
    res.status(201).json(await createDraft(ctx.db, contextOf(req), body));
  });

  // Suggestions from a price history: computed and returned, never stored.
  defineRoute(r, M, { method: 'post', path: '/history', access: 'assumptions:edit' }, csvUpload('file'), async (req, res) => {
    res.json(await suggestionForScheme(ctx.db, req.scheme!.id, { buffer: req.file!.buffer, name: req.file!.originalname }));
  });

  defineRoute(r, M, { method: 'get', path: '/:setId', access: 'assumptions:read' }, async (req, res) => {
    const { setId } = SetId.parse(req.params);
    res.json(await getSet(ctx.db, req.scheme!.id, setId));
  });

  defineRoute(r, M, { method: 'put', path: '/:setId', access: 'assumptions:edit' }, async (req, res) => {
    const { setId } = SetId.parse(req.params);
    const body = AssumptionSetBody.parse(req.body);
    res.json(await updateDraft(ctx.db, contextOf(req), setId, body));
  });

  defineRoute(r, M, { method: 'delete', path: '/:setId', access: 'assumptions:edit' }, async (req, res) => {
    const { setId } = SetId.parse(req.params);
    await deleteDraft(ctx.db, contextOf(req), setId);
    res.json({ ok: true });
  });

  defineRoute(r, M, { method: 'post', path: '/:setId/drafts', access: 'assumptions:edit' }, async (req, res) => {
    const { setId } = SetId.parse(req.params);
    res.status(201).json(await copyToDraft(ctx.db, contextOf(req), setId));
  });

  defineRoute(r, M, { method: 'post', path: '/:setId/approve', access: 'assumptions:approve' }, async (req, res) => {
    const { setId } = SetId.parse(req.params);
    res.json(await approve(ctx.db, contextOf(req), setId));
  });

  defineRoute(r, M, { method: 'get', path: '/:setId/compare/:otherId', access: 'assumptions:read' }, async (req, res) => {
    const { setId, otherId } = Pair.parse(req.params);
    res.json(await compareVersions(ctx.db, req.scheme!.id, setId, otherId));
  });

  return r;
}
