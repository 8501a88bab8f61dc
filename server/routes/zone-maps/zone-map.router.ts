import { Router } from 'express';
import { z } from 'zod';
import { idParamsSchema, idSchema } from '../../../shared/schemas/common.schema';
import {
  addZoneSchema,
  createZoneMapSchema,
  mergeZonesSchema,
  newZoneMapVersionSchema,
  resolveOverlapSchema,
  splitZoneSchema,
  updateZoneSchema,
  zoneMapExportQuerySchema,
  zoneMapFromImportSchema,
  zonesFromPointsPreviewRequestSchema,
  zonesFromPointsSchema,
  zoneMapListQuerySchema,
  zoneMapVersionOnlySchema,
  zoneMapVersionQuerySchema,
} from '../../../shared/schemas/zone-map.schema';
import { actorOf, handle } from '../../middleware/handle';
import { requireRole, requireSignIn } from '../../middleware/authenticate';
import * as maps from './zone-map.service';
import { exportZoneMap } from './zone-map.export';
import * as sources from './zone-map-sources.service';
import { importErrors } from '../imports/import.router';
import { sendFile } from '../../lib/send-file';

const zoneParamsSchema = z.object({ id: idSchema, zoneId: idSchema });

/**
 * Zone maps (DEVELOPERS.md "Boundaries and zones"). Every role reads within its scope; admin and agronomist
 * create and edit. Each edit carries the map's `version` and answers the whole zone map.
 */
export function zoneMapRouter() {
  const router = Router();
  const write = requireRole('admin', 'agronomist');
  router.use(requireSignIn);

  router.get(
    '/',
    handle({ query: zoneMapListQuerySchema }, ({ req, query }) => maps.listZoneMaps(actorOf(req), query)),
  );
  router.get(
    '/:id',
    handle({ params: idParamsSchema }, ({ req, params }) => maps.getZoneMap(actorOf(req), params.id)),
  );
  router.get(
    '/:id/export',
    handle(
      { params: idParamsSchema, query: zoneMapExportQuerySchema },
      async ({ req, res, params, query }) => {
        sendFile(res, await exportZoneMap(actorOf(req), params.id, query.format));
      },
    ),
  );

  router.post(
    '/',
    write,
    handle({ body: createZoneMapSchema }, async ({ req, res, body }) => {
      res.status(201).json(await maps.createZoneMap(actorOf(req), body));
    }),
  );
  router.post(
    '/from-import',
    write,
    handle({ body: zoneMapFromImportSchema }, async ({ req, res, body }) => {
      res.status(201).json(await sources.createFromImport(actorOf(req), body));
    }),
  );
  router.post(
    '/from-points/preview',
    write,
    handle({ body: zonesFromPointsPreviewRequestSchema }, ({ req, body }) =>
      sources.previewFromPoints(actorOf(req), body),
    ),
  );
  router.post(
    '/from-points',
    write,
    handle({ body: zonesFromPointsSchema }, async ({ req, res, body }) => {
      res.status(201).json(await sources.createFromPoints(actorOf(req), body));
    }),
  );
  router.post(
    '/:id/new-version',
    write,
    handle({ params: idParamsSchema, body: newZoneMapVersionSchema }, async ({ req, res, params, body }) => {
      res.status(201).json(await maps.newVersion(actorOf(req), params.id, body));
    }),
  );

  router.post(
    '/:id/archive',
    write,
    handle({ params: idParamsSchema }, ({ req, params }) =>
      maps.setZoneMapArchived(actorOf(req), params.id, true),
    ),
  );
  router.post(
    '/:id/restore',
    write,
    handle({ params: idParamsSchema }, ({ req, params }) =>
      maps.setZoneMapArchived(actorOf(req), params.id, false),
    ),
  );
  router.post(
    '/:id/zones',
    write,
    handle({ params: idParamsSchema, body: addZoneSchema }, ({ req, params, body }) =>
      maps.addZone(actorOf(req), params.id, body),
    ),
  );
  router.put(
    '/:id/zones/:zoneId',
    write,
    handle({ params: zoneParamsSchema, body: updateZoneSchema }, ({ req, params, body }) =>
      maps.updateZone(actorOf(req), params.id, params.zoneId, body),
    ),
  );
  router.delete(
    '/:id/zones/:zoneId',
    write,
    handle({ params: zoneParamsSchema, query: zoneMapVersionQuerySchema }, ({ req, params, query }) =>
      maps.deleteZone(actorOf(req), params.id, params.zoneId, query.version),
    ),
  );
  router.post(
    '/:id/split',
    write,
    handle({ params: idParamsSchema, body: splitZoneSchema }, ({ req, params, body }) =>
      maps.split(actorOf(req), params.id, body),
    ),
  );
  router.post(
    '/:id/merge',
    write,
    handle({ params: idParamsSchema, body: mergeZonesSchema }, ({ req, params, body }) =>
      maps.merge(actorOf(req), params.id, body),
    ),
  );
  router.post(
    '/:id/resolve-overlap',
    write,
    handle({ params: idParamsSchema, body: resolveOverlapSchema }, ({ req, params, body }) =>
      maps.resolveOverlap(actorOf(req), params.id, body),
    ),
  );
  router.post(
    '/:id/fill-gaps',
    write,
    handle({ params: idParamsSchema, body: zoneMapVersionOnlySchema }, ({ req, params, body }) =>
      maps.fillGaps(actorOf(req), params.id, body.version),
    ),
  );
  // Errors of reading an import (unreadable file, coordinates not chosen) keep the statuses the import routes give.
  router.use(importErrors);
  return router;
}
