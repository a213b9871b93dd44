import { Router } from 'express';
import { addMemberBody, memberParams, updateMemberBody } from '../../common/contracts/members';
import { trialSlugParams } from '../../common/contracts/trials';
import type { AppDeps } from '../app-deps';
import { actorOf } from '../auth/actor';
import { endpoint } from '../lib/endpoint';
import * as service from './members-service';

/**
 * /api/trials/:slug/members — who is in the trial, with which role (and sites). Signed-out
 * callers go through the trial check like everyone else, so an unpublished trial stays a 404.
 */
export function membersRouter({ db }: Pick<AppDeps, 'db'>) {
  const router = Router({ mergeParams: true });
  router.get(
    '/',
    endpoint({ params: trialSlugParams }, async ({ params }, _req, res) => {
      res.json(await service.memberList(db, params.slug, actorOf(res)));
    }),
  );
  router.post(
    '/',
    endpoint(
      { params: trialSlugParams, body: addMemberBody },
      async ({ params, body }, _req, res) => {
        const { created, member } = await service.addMember(db, params.slug, actorOf(res), body);
        res.status(created ? 201 : 200).json(member);
      },
    ),
  );
  router.patch(
    '/:userId',
    endpoint(
      { params: memberParams, body: updateMemberBody },
      async ({ params, body }, _req, res) => {
        res.json(await service.updateMember(db, params.slug, actorOf(res), params.userId, body));
      },
    ),
  );
  router.delete(
    '/:userId',
    endpoint({ params: memberParams }, async ({ params }, _req, res) => {
      await service.removeMember(db, params.slug, actorOf(res), params.userId);
      res.status(204).end();
    }),
  );
  return router;
}
