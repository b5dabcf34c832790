import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../context';
import { defineRoute } from '../routing';
import { contextOf } from '../services/context';
import { OptionBody } from '../../schemas/options';
import { setCurrentDefault } from '../services/governance';
import { approveVersion, compareVersions, createOption, discardDraft, getOption, getVersion, getVersionById, listOptions, setArchived, updateOption } from '../services/options';

// The request body (a version's content) is shared with the glide-path form (schemas/options.ts).

const Id = z.uuid('is not a valid id');
const OptionId = z.object({ optionId: Id });
const VersionIds = z.object({ optionId: Id, versionId: Id });
const Pair = z.object({ optionId: Id, versionId: Id, otherId: Id });
const ListQuery = z.object({ archived: z.enum(['0', '1']).default('0') });
const ArchiveBody = z.object({ archived: z.boolean() }).strict();
const CurrentDefaultBody = z.strictObject({ optionId: Id.nullable() });

/** Candidate default investment options and their versions, kept and approved by trustees. */
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

  // An edit changes a pending draft, or starts the next version as a draft.
  defineRoute(r, M, { method: 'put', path: '/:optionId', access: 'options:edit' }, async (req, res) => {
    const { optionId } = OptionId.parse(req.params);
    res.json(await updateOption(ctx.db, contextOf(req), optionId, OptionBody.parse(req.body)));
  });

  defineRoute(r, M, { method: 'post', path: '/:optionId/archive', access: 'options:edit' }, async (req, res) => {
    const { optionId } = OptionId.parse(req.params);
    res.json(await setArchived(ctx.db, contextOf(req), optionId, ArchiveBody.parse(req.body).archived));
  });

  defineRoute(r, M, { method: 'get', path: '/:optionId/versions/:versionId', access: 'options:read' }, async (req, res) => {
    const { optionId, versionId } = VersionIds.parse(req.params);
    res.json(await getVersion(ctx.db, req.scheme!.id, optionId, versionId));
  });

  defineRoute(r, M, { method: 'post', path: '/:optionId/versions/:versionId/approve', access: 'options:approve' }, async (req, res) => {
    const { optionId, versionId } = VersionIds.parse(req.params);
    res.json(await approveVersion(ctx.db, contextOf(req), optionId, versionId));
  });

  defineRoute(r, M, { method: 'delete', path: '/:optionId/versions/:versionId', access: 'options:edit' }, async (req, res) => {
    const { optionId, versionId } = VersionIds.parse(req.params);
    await discardDraft(ctx.db, contextOf(req), optionId, versionId);
    res.json({ ok: true });
  });

  // Two versions side by side; the other may belong to another option of the scheme.
  defineRoute(r, M, { method: 'get', path: '/:optionId/versions/:versionId/compare/:otherId', access: 'options:read' }, async (req, res) => {
    const { optionId, versionId, otherId } = Pair.parse(req.params);
    const a = await getVersion(ctx.db, req.scheme!.id, optionId, versionId);
    const b = await getVersionById(ctx.db, req.scheme!.id, otherId);
    res.json(compareVersions(a, b));
  });

  // The scheme's current default option: the baseline every comparison shows first.
  defineRoute(r, '/schemes/:schemeId', { method: 'put', path: '/current-default', access: 'options:edit' }, async (req, res) => {
    const { optionId } = CurrentDefaultBody.parse(req.body);
    res.json({ currentDefault: await setCurrentDefault(ctx.db, contextOf(req), optionId) });
  });

  return r;
}
