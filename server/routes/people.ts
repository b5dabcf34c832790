import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../context';
import { defineRoute } from '../routing';
import { ROLES } from '../../constants/permissions';
import { contextOf } from '../services/context';
import { cancelInvitation, changeRole, invite, issueReset, listPeople, removePerson, resendInvitation } from '../services/people';

const InviteBody = z.object({ email: z.string().trim().email('is not an e-mail address').max(254, 'is too long'), role: z.enum(ROLES) });
const RoleBody = z.object({ role: z.enum(ROLES) });
const Uuid = z.string().uuid('is not a valid id');

/** People and roles on a scheme, and invitations to it (the scheme administrator). */
export function peopleRouter(ctx: AppContext): Router {
  const r = Router({ mergeParams: true });
  const M = '/schemes/:schemeId';

  defineRoute(r, M, { method: 'get', path: '/people', access: 'people:manage' }, async (req, res) => {
    res.json(await listPeople(ctx, contextOf(req)));
  });

  defineRoute(r, M, { method: 'post', path: '/invitations', access: 'people:manage' }, async (req, res) => {
    res.status(201).json(await invite(ctx, contextOf(req), InviteBody.parse(req.body)));
  });

  defineRoute(r, M, { method: 'post', path: '/invitations/:invitationId/resend', access: 'people:manage' }, async (req, res) => {
    res.status(201).json(await resendInvitation(ctx, contextOf(req), Uuid.parse(req.params.invitationId)));
  });

  defineRoute(r, M, { method: 'delete', path: '/invitations/:invitationId', access: 'people:manage' }, async (req, res) => {
    res.json(await cancelInvitation(ctx, contextOf(req), Uuid.parse(req.params.invitationId)));
  });

  defineRoute(r, M, { method: 'patch', path: '/people/:userId', access: 'people:manage' }, async (req, res) => {
    res.json(await changeRole(ctx, contextOf(req), Uuid.parse(req.params.userId), RoleBody.parse(req.body).role));
  });

  defineRoute(r, M, { method: 'delete', path: '/people/:userId', access: 'people:manage' }, async (req, res) => {
    res.json(await removePerson(ctx, contextOf(req), Uuid.parse(req.params.userId)));
  });

  defineRoute(r, M, { method: 'post', path: '/people/:userId/reset-link', access: 'people:manage' }, async (req, res) => {
    res.status(202).json(await issueReset(ctx, contextOf(req), Uuid.parse(req.params.userId)));
  });

  return r;
}
