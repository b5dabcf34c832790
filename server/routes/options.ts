import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../context';
import { defineRoute } from '../routing';
import { contextOf } from '../services/context';
import { OptionBody } from '../../schemas/options';
import { createOption, getOption, listOptions, setArchived, updateOption } from '../services/options';

// The request body is shared with the glide-path form (schemas/options.ts).

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
