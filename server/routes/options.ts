import { Router } from 'express';
import { createInsertSchema } from 'drizzle-zod';
import { z } from 'zod';
import type { AppContext } from '../context';
import { defineRoute } from '../routing';
import { contextOf } from '../services/context';
import { defaultOptions } from '../../db/schema';
import { GlidePointSchema } from '../../simulation';
import { createOption, getOption, listOptions, setArchived, updateOption } from '../services/options';

/** A default option: its glide path uses the engine's point schema (weights are fractions summing to 1). */
export const OptionBody = createInsertSchema(defaultOptions)
  .pick({ name: true, description: true, glidePath: true })
  .extend({
    name: z.string().trim().min(1, 'must not be empty').max(120, 'must be at most 120 characters'),
    description: z.string().trim().max(2000, 'must be at most 2,000 characters').default(''),
    glidePath: z.array(GlidePointSchema).min(1, 'needs at least one point').max(30, 'at most 30 points'),
  })
  .strict()
  .superRefine((o, ctx) => {
    const seen = new Map<number, number>();
    o.glidePath.forEach((p, i) => {
      const earlier = seen.get(p.yearsToRetirement);
      if (earlier !== undefined) ctx.addIssue({ code: 'custom', path: ['glidePath', i, 'yearsToRetirement'], message: `repeats ${p.yearsToRetirement} years to retirement (also point ${earlier})` });
      else seen.set(p.yearsToRetirement, i);
    });
  });

const OptionId = z.object({ optionId: z.uuid('is not a valid id') });
const ListQuery = z.object({ archived: z.enum(['0', '1']).default('0') });
const ArchiveBody = z.object({ archived: z.boolean() }).strict();

/** Candidate default investment options, kept by trustees. */
export function optionsRouter(ctx: AppContext): Router {
  const r = Router({ mergeParams: true });
  const M = '/schemes/:schemeId/options';

  defineRoute(r, M, { method: 'get', path: '', access: 'options:read' }, async (req, res) => {
    const q = ListQuery.parse(req.query);
    res.json({ options: await listOptions(ctx.db, req.scheme!.id, q.archived === '1') });
  });

  defineRoute(r, M, { method: 'post', path: '', access: 'options:edit' }, async (req, res) => {
    res.status(201).json(await createOption(ctx.db, contextOf(req), OptionBody.parse(req.body)));
  });

  defineRoute(r, M, { method: 'get', path: '/:optionId', access: 'options:read' }, async (req, res) => {
    const { optionId } = OptionId.parse(req.params);
    res.json(await getOption(ctx.db, req.scheme!.id, optionId));
  });

  defineRoute(r, M, { method: 'put', path: '/:optionId', access: 'options:edit' }, async (req, res) => {
    const { optionId } = OptionId.parse(req.params);
    res.json(await updateOption(ctx.db, contextOf(req), optionId, OptionBody.parse(req.body)));
  });

  defineRoute(r, M, { method: 'post', path: '/:optionId/archive', access: 'options:edit' }, async (req, res) => {
    const { optionId } = OptionId.parse(req.params);
    res.json(await setArchived(ctx.db, contextOf(req), optionId, ArchiveBody.parse(req.body).archived));
  });

  return r;
}
