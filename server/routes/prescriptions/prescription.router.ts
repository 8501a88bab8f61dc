import { Router } from 'express';
import { idParamsSchema } from '../../../shared/schemas/common.schema';
import {
  acceptCheckSchema,
  createPrescriptionSchema,
  prescriptionExportQuerySchema,
  prescriptionListQuerySchema,
  prescriptionVersionOnlySchema,
  prescriptionVersionQuerySchema,
  seedOrderQuerySchema,
  updatePrescriptionSchema,
} from '../../../shared/schemas/prescription.schema';
import { actorOf, handle } from '../../middleware/handle';
import { requireRole, requireSignIn } from '../../middleware/authenticate';
import type { Mailer } from '../../mail/mailer';
import { safeFileName } from '../../lib/shapefile-write';
import { sendFile } from '../../lib/send-file';
import * as rx from './prescription.service';
import { exportPrescription } from './prescription.export';
import { approvalNotifier } from './prescription.mail';
import { seedOrder, seedOrderCsv, unitSystemOf } from './seed-order.service';

/**
 * Prescriptions (DEVELOPERS.md "Prescriptions"). Everyone reads within scope; the agronomist (and admin)
 * writes and approves; the farmer exports; the consultant reads.
 */
export function prescriptionRouter({ mailer, appUrl }: { mailer: Mailer; appUrl: string }) {
  const router = Router();
  const write = requireRole('admin', 'agronomist');
  const notify = approvalNotifier(mailer, appUrl);
  router.use(requireSignIn);

  router.get(
    '/',
    handle({ query: prescriptionListQuerySchema }, ({ req, query }) =>
      rx.listPrescriptions(actorOf(req), query),
    ),
  );
  router.get(
    '/:id',
    handle({ params: idParamsSchema }, ({ req, params }) => rx.getPrescription(actorOf(req), params.id)),
  );
  router.get(
    '/:id/export',
    requireRole('admin', 'agronomist', 'farmer'),
    handle(
      { params: idParamsSchema, query: prescriptionExportQuerySchema },
      async ({ req, res, params, query }) => {
        sendFile(res, await exportPrescription(actorOf(req), params.id, query));
      },
    ),
  );
  router.post(
    '/',
    write,
    handle({ body: createPrescriptionSchema }, async ({ req, res, body }) => {
      res.status(201).json(await rx.createPrescription(actorOf(req), body));
    }),
  );
  router.put(
    '/:id',
    write,
    handle({ params: idParamsSchema, body: updatePrescriptionSchema }, ({ req, params, body }) =>
      rx.updatePrescription(actorOf(req), params.id, body),
    ),
  );
  router.post(
    '/:id/accept-check',
    write,
    handle({ params: idParamsSchema, body: acceptCheckSchema }, ({ req, params, body }) =>
      rx.acceptCheck(actorOf(req), params.id, body),
    ),
  );
  router.post(
    '/:id/approve',
    write,
    handle({ params: idParamsSchema, body: prescriptionVersionOnlySchema }, ({ req, params, body }) =>
      rx.approvePrescription(actorOf(req), params.id, body.version, notify),
    ),
  );
  router.post(
    '/:id/new-version',
    write,
    handle({ params: idParamsSchema }, async ({ req, res, params }) => {
      res.status(201).json(await rx.newVersion(actorOf(req), params.id));
    }),
  );
  router.delete(
    '/:id',
    write,
    handle(
      { params: idParamsSchema, query: prescriptionVersionQuerySchema },
      async ({ req, res, params, query }) => {
        await rx.deleteDraft(actorOf(req), params.id, query.version);
        res.status(204).end();
      },
    ),
  );
  return router;
}

/** A grower's seed (and product) order for a year, as JSON for the page or CSV to download. */
export function seedOrderRouter() {
  const router = Router();
  router.use(requireSignIn);
  router.get(
    '/',
    handle({ query: seedOrderQuerySchema }, async ({ req, res, query }) => {
      const actor = actorOf(req);
      const order = await seedOrder(actor, query);
      if (query.format === 'json') return order;
      sendFile(res, {
        body: seedOrderCsv(order, await unitSystemOf(actor)),
        contentType: 'text/csv; charset=utf-8',
        fileName: `${safeFileName([order.growerName, String(order.year), 'order'])}.csv`,
      });
      return undefined;
    }),
  );
  return router;
}
