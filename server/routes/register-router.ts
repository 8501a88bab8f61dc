import { Router } from 'express';
import type { z } from 'zod';
import { idParamsSchema } from '../../shared/schemas/common.schema';
import type { Role } from '../../shared/schemas/auth.schema';
import { actorOf, handle } from '../middleware/handle';
import { requireRole, requireSignIn } from '../middleware/authenticate';
import type { Actor } from '../types';

type Service<LQ extends z.ZodType, C extends z.ZodType, U extends z.ZodType, Dto> = {
  listQuery: LQ;
  createSchema: C;
  updateSchema: U;
  /** Roles that may create, edit, archive and restore; every role may read its own scope. */
  writeRoles: Role[];
  list(actor: Actor, query: z.output<LQ>): Promise<{ items: Dto[] }>;
  get(actor: Actor, id: string): Promise<Dto>;
  create(actor: Actor, input: z.output<C>): Promise<Dto>;
  update(actor: Actor, id: string, input: z.output<U>): Promise<Dto>;
  setArchived(actor: Actor, id: string, archived: boolean): Promise<Dto>;
};

/** The routes every register resource has: list, read, create, edit, archive, restore. */
export function registerRouter<LQ extends z.ZodType, C extends z.ZodType, U extends z.ZodType, Dto>(
  s: Service<LQ, C, U, Dto>,
) {
  const router = Router();
  const write = requireRole(...s.writeRoles);
  router.use(requireSignIn);
  router.get(
    '/',
    handle({ query: s.listQuery }, ({ req, query }) => s.list(actorOf(req), query as z.output<LQ>)),
  );
  router.get(
    '/:id',
    handle({ params: idParamsSchema }, ({ req, params }) => s.get(actorOf(req), params.id)),
  );
  router.post(
    '/',
    write,
    handle({ body: s.createSchema }, async ({ req, res, body }) => {
      res.status(201).json(await s.create(actorOf(req), body as z.output<C>));
    }),
  );
  router.put(
    '/:id',
    write,
    handle({ params: idParamsSchema, body: s.updateSchema }, ({ req, params, body }) =>
      s.update(actorOf(req), params.id, body as z.output<U>),
    ),
  );
  router.post(
    '/:id/archive',
    write,
    handle({ params: idParamsSchema }, ({ req, params }) => s.setArchived(actorOf(req), params.id, true)),
  );
  router.post(
    '/:id/restore',
    write,
    handle({ params: idParamsSchema }, ({ req, params }) => s.setArchived(actorOf(req), params.id, false)),
  );
  return router;
}
