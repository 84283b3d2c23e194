import { changeRoleSchema, createStudioSchema, inviteSchema, updateStudioSchema } from '@shared/api/studio.schema';
import { ApiRouter } from '../../core/api-router';
import { forbidden } from '../../core/app-error';
import { idParam, publicAccess, signedIn, studioRole } from '../../core/policy';
import type { StudiosService } from './studios.service';

/** /api/studios: the caller's studios, members and invites. */
export function studiosRoutes(studios: StudiosService): ApiRouter {
  const api = new ApiRouter('/studios', 'Studios');

  api.route('get', '/', { policy: signedIn, summary: 'Studios the caller belongs to, with their role' }, async (req, res) => {
    res.json({ studios: await studios.listForUser(req.user.id) });
  });
  api.route(
    'post',
    '/',
    { policy: signedIn, summary: 'Create a studio; the caller becomes its owner', body: createStudioSchema, status: 201 },
    async (req, res) => {
      res.status(201).json({ studio: await studios.create(req.user, req.body.name) });
    },
  );
  api.route('get', '/:studioId', { policy: studioRole('viewer'), summary: 'One studio' }, async (req, res) => {
    res.json({ studio: await studios.get(req.membership.studioId, req.membership.role) });
  });
  api.route(
    'patch',
    '/:studioId',
    { policy: studioRole('owner'), summary: 'Rename a studio', body: updateStudioSchema },
    async (req, res) => {
      res.json({ studio: await studios.rename(req.membership.studioId, req.body.name, req.membership.role) });
    },
  );
  api.route(
    'delete',
    '/:studioId',
    { policy: studioRole('owner'), summary: 'Delete a studio and everything in it', status: 204 },
    async (req, res) => {
      await studios.remove(req.membership.studioId);
      res.status(204).end();
    },
  );

  api.route('get', '/:studioId/members', { policy: studioRole('viewer'), summary: 'Members and their roles' }, async (req, res) => {
    res.json({ members: await studios.members(req.membership.studioId) });
  });
  api.route(
    'patch',
    '/:studioId/members/:userId',
    { policy: studioRole('owner'), summary: "Change a member's role", body: changeRoleSchema },
    async (req, res) => {
      res.json({
        member: await studios.changeRole(req.membership.studioId, idParam(req, 'userId', 'The member'), req.body.role, req.user.id),
      });
    },
  );
  api.route(
    'delete',
    '/:studioId/members/:userId',
    { policy: studioRole('viewer'), summary: 'Remove a member (owners), or leave (yourself)', status: 204 },
    async (req, res) => {
      const { studioId, userId, role } = req.membership;
      if (idParam(req, 'userId', 'The member') !== userId && role !== 'owner') throw forbidden('Only owners remove other members.');
      await studios.removeMember(studioId, idParam(req, 'userId', 'The member'), userId);
      res.status(204).end();
    },
  );

  api.route('get', '/:studioId/invites', { policy: studioRole('owner'), summary: 'Pending invites' }, async (req, res) => {
    res.json({ invites: await studios.pendingInvites(req.membership.studioId) });
  });
  api.route(
    'post',
    '/:studioId/invites',
    { policy: studioRole('owner'), summary: 'Invite someone by e-mail', body: inviteSchema, status: 201 },
    async (req, res) => {
      res.status(201).json({ invite: await studios.invite(req.membership.studioId, req.user, req.body.email, req.body.role) });
    },
  );
  api.route(
    'delete',
    '/:studioId/invites/:inviteId',
    { policy: studioRole('owner'), summary: 'Revoke a pending invite', status: 204 },
    async (req, res) => {
      await studios.revokeInvite(req.membership.studioId, idParam(req, 'inviteId', 'The invite'));
      res.status(204).end();
    },
  );

  return api;
}

/** /api/invites/:token: what an invite link shows, and accepting it. */
export function inviteLinkRoutes(studios: StudiosService): ApiRouter {
  const api = new ApiRouter('/invites', 'Studios');
  api.route('get', '/:token', { policy: publicAccess, summary: 'What an invite link offers' }, async (req, res) => {
    res.set('Referrer-Policy', 'no-referrer');
    res.json({ invite: await studios.previewInvite(String(req.params.token)) });
  });
  api.route('post', '/:token/accept', { policy: signedIn, summary: 'Accept an invite as the signed-in user' }, async (req, res) => {
    const studio = await studios.acceptInvite(String(req.params.token), req.user);
    // Accepting proved the address: the account kept in this session says so from now on.
    if (!req.user.emailVerified) {
      req.user.emailVerified = true;
      (req.session as unknown as { passport: { user: Express.User } }).passport.user = { ...req.user };
    }
    res.json({ studio });
  });
  return api;
}
