import { Router } from 'express';
import { idParamsSchema } from '../../../shared/schemas/common.schema';
import { setBoundarySchema } from '../../../shared/schemas/import.schema';
import { actorOf, handle } from '../../middleware/handle';
import { requireRole, requireSignIn } from '../../middleware/authenticate';
import { setFieldBoundary } from '../imports/boundary.service';
import { importErrors } from '../imports/import.router';

/** PUT /api/fields/:id/boundary (admin, agronomist): from an import's features or a drawn geometry. */
export function boundaryRouter() {
  const router = Router();
  router.put(
    '/:id/boundary',
    requireSignIn,
    requireRole('admin', 'agronomist'),
    handle({ params: idParamsSchema, body: setBoundarySchema }, ({ req, params, body }) =>
      setFieldBoundary(actorOf(req), params.id, body),
    ),
  );
  router.use(importErrors);
  return router;
}
