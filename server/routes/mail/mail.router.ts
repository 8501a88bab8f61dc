import { Router } from 'express';
import { User } from '../../db/associations';
import { actorOf, handle } from '../../middleware/handle';
import { requireRole } from '../../middleware/authenticate';
import type { Mailbox } from '../../mail/smtp-fake';

/**
 * The local mail catcher's messages, for an admin: only those sent to people of the admin's workspace,
 * so one practice never reads another's invitations.
 */
export function mailRouter(mailbox: Mailbox | null) {
  const router = Router();
  router.use(requireRole('admin'));
  router.get(
    '/',
    handle({}, async ({ req }) => {
      if (!mailbox) return { items: [] };
      const people = await User.findAll({
        where: { workspaceId: actorOf(req).workspaceId },
        attributes: ['email'],
      });
      const ours = new Set(people.map((p) => p.email.toLowerCase()));
      const items = mailbox
        .messages()
        .filter((m) => m.to.some((t) => ours.has(t)))
        .map((m) => ({ ...m, to: m.to.filter((t) => ours.has(t)) }));
      return { items };
    }),
  );
  return router;
}
