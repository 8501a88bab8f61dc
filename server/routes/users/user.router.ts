import { Router } from 'express';
import { idParamsSchema } from '../../../shared/schemas/common.schema';
import { inviteUserSchema, updateUserSchema } from '../../../shared/schemas/user.schema';
import { actorOf, handle } from '../../middleware/handle';
import { requireRole } from '../../middleware/authenticate';
import { User } from '../../db/associations';
import type { Mailer } from '../../mail/mailer';
import * as users from './user.service';

async function nameOf(userId: string) {
  return (await User.findByPk(userId, { attributes: ['name'] }))?.name ?? 'An admin';
}

/** People of the workspace: admin only. */
export function userRouter({ mailer, appUrl }: { mailer: Mailer; appUrl: string }) {
  const router = Router();
  router.use(requireRole('admin'));
  router.get(
    '/',
    handle({}, ({ req }) => users.listUsers(actorOf(req))),
  );
  router.get(
    '/:id',
    handle({ params: idParamsSchema }, ({ req, params }) => users.getUser(actorOf(req), params.id)),
  );
  router.post(
    '/',
    handle({ body: inviteUserSchema }, async ({ req, res, body }) => {
      const actor = actorOf(req);
      res.status(201).json(await users.inviteUser(actor, body, mailer, appUrl, await nameOf(actor.userId)));
    }),
  );
  router.put(
    '/:id',
    handle({ params: idParamsSchema, body: updateUserSchema }, ({ req, params, body }) =>
      users.updateUser(actorOf(req), params.id, body),
    ),
  );
  router.post(
    '/:id/resend-invitation',
    handle({ params: idParamsSchema }, async ({ req, res, params }) => {
      const actor = actorOf(req);
      await users.resendInvitation(actor, params.id, mailer, appUrl, await nameOf(actor.userId));
      res.status(202).json({ message: 'Invitation sent again' });
    }),
  );
  return router;
}
