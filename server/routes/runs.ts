import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../context';
import { defineRoute } from '../routing';
import { contextOf } from '../services/context';
import { runForRole } from '../services/runAccess';
import { getRun, listRuns, requestRun, rerun, runChoices, runComparison } from '../services/runs';
import { ComparisonQuery, RunBody } from '../../schemas/runs';

const Uuid = z.uuid('is not a valid id');

const ListQuery = z.object({ limit: z.coerce.number().int().min(1).max(200).default(50) });


export function runsRouter(ctx: AppContext): Router {
  const r = Router({ mergeParams: true });
  const M = '/schemes/:schemeId';

  defineRoute(r, M, { method: 'get', path: '/run-choices', access: 'runs:create' }, async (req, res) => {
    res.json(await runChoices(ctx, req.scheme!.id));
  });

  defineRoute(r, M, { method: 'get', path: '/runs', access: 'runs:read' }, async (req, res) => {
    const q = ListQuery.parse(req.query);
    res.json({ runs: await listRuns(ctx, req.scheme!.id, q.limit) });
  });

  defineRoute(r, M, { method: 'post', path: '/runs', access: 'runs:create' }, async (req, res) => {
    const body = RunBody.parse(req.body ?? {});
    res.status(201).json(await requestRun(ctx, contextOf(req), body));
  });

  defineRoute(r, M, { method: 'get', path: '/runs/:runId', access: 'runs:read' }, async (req, res) => {
    const runId = Uuid.parse(req.params.runId);
    // Fund assumptions only for roles that may read them.
    res.json(runForRole(await getRun(ctx, req.scheme!.id, runId), req.scheme!.role));
  });

  defineRoute(r, M, { method: 'get', path: '/runs/:runId/comparison', access: 'runs:read' }, async (req, res) => {
    const runId = Uuid.parse(req.params.runId);
    const query = ComparisonQuery.parse(req.query);
    res.json(await runComparison(ctx, req.scheme!.id, runId, query));
  });

  defineRoute(r, M, { method: 'post', path: '/runs/:runId/rerun', access: 'runs:create' }, async (req, res) => {
    const runId = Uuid.parse(req.params.runId);
    res.status(201).json(await rerun(ctx, contextOf(req), runId));
  });

  return r;
}
