import { Router } from 'express';
import { fromNodeHeaders } from 'better-auth/node';
import {
  createInvitationBody,
  invitationParams,
  invitationSignUpBody,
  invitationTokenBody,
} from '../../common/contracts/invitations';
import { trialSlugParams } from '../../common/contracts/trials';
import type { AppDeps } from '../app-deps';
import { actorOf } from '../auth/actor';
import { endpoint } from '../lib/endpoint';
import * as service from './invitations-service';

type Deps = Pick<AppDeps, 'db' | 'mail' | 'baseUrl' | 'auth'>;

/** /api/trials/:slug/invitations — a lead's open invitations. */
export function trialInvitationsRouter(deps: Deps) {
  const router = Router({ mergeParams: true });
  router.get(
    '/',
    endpoint({ params: trialSlugParams }, async ({ params }, _req, res) => {
      res.json(await service.listInvitations(deps, params.slug, actorOf(res)));
    }),
  );
  router.post(
    '/',
    endpoint(
      { params: trialSlugParams, body: createInvitationBody },
      async ({ params, body }, _req, res) => {
        res.status(201).json(await service.createInvitation(deps, params.slug, actorOf(res), body));
      },
    ),
  );
  router.post(
    '/:invitationId/resend',
    endpoint({ params: invitationParams }, async ({ params }, _req, res) => {
      res.json(
        await service.resendInvitation(deps, params.slug, actorOf(res), params.invitationId),
      );
    }),
  );
  router.delete(
    '/:invitationId',
    endpoint({ params: invitationParams }, async ({ params }, _req, res) => {
      await service.revokeInvitation(deps, params.slug, actorOf(res), params.invitationId);
      res.status(204).end();
    }),
  );
  return router;
}

/**
 * /api/invitations — what the person holding a link uses. The token is sent in the body (it
 * sits in the link's fragment), never in a URL that would reach the logs.
 */
export function invitationLinksRouter(deps: Deps) {
  const router = Router();
  router.post(
    '/lookup',
    endpoint({ body: invitationTokenBody }, async ({ body }, _req, res) => {
      res.json(await service.previewInvitation(deps.db, body.token));
    }),
  );
  router.post(
    '/accept',
    endpoint({ body: invitationTokenBody }, async ({ body }, _req, res) => {
      res.json(await service.acceptInvitation(deps.db, body.token, actorOf(res)));
    }),
  );
  router.post(
    '/sign-up',
    endpoint({ body: invitationSignUpBody }, async ({ body }, req, res) => {
      const { email, response } = await service.signUpWithInvitation(deps.db, body);
      // The new account is signed in on the spot, through the sign-in library's own session.
      const { headers } = await deps.auth.api.signInEmail({
        body: { email, password: body.password },
        headers: fromNodeHeaders(req.headers),
        returnHeaders: true,
      });
      for (const cookie of headers.getSetCookie()) res.append('Set-Cookie', cookie);
      res.status(201).json(response);
    }),
  );
  return router;
}
