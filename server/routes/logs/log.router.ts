import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { z } from 'zod';
import { idParamsSchema, idSchema, versionSchema } from '../../../shared/schemas/common.schema';
import { cleaningSettingsSchema, createLogSchema } from '../../../shared/schemas/as-applied.schema';
import { actorOf, handle } from '../../middleware/handle';
import { requireRole, requireSignIn } from '../../middleware/authenticate';
import { DomainError, ValidationError } from '../../errors';
import type { Mailer } from '../../mail/mailer';
import type { FileStore, ReceivedFile } from '../../logs/file-store';
import { FileReadError } from '../imports/import-errors';
import { importErrors } from '../imports/import.router';
import { unitSystemOf } from '../prescriptions/prescription.dto';
import { safeFileName } from '../../lib/shapefile-write';
import { sendFile } from '../../lib/send-file';
import * as logs from './log.service';
import * as audits from './audit.service';
import { logTile } from './log-tiles';
import { auditNotifier } from './log.mail';

/**
 * Multipart with one log file streamed to disk while it is hashed (never held whole in memory), never more
 * than the limit (413 beyond it). `req.file` then carries the `ReceivedFile` of `FileStore.receive`.
 */
const uploadTo =
  (files: FileStore): RequestHandler =>
  (req, res, next) => {
    const storage: multer.StorageEngine = {
      _handleFile(_req, file, cb) {
        files.receive(file.stream).then(
          (received) => cb(null, { ...received, path: received.tmp, size: received.sizeBytes }),
          (err: Error) => cb(err),
        );
      },
      _removeFile(_req, file, cb) {
        files.discard(file.path).then(
          () => cb(null),
          (err: Error) => cb(err),
        );
      },
    };
    multer({
      storage,
      limits: { fileSize: logs.MAX_LOG_BYTES, files: 1, fields: 4, fieldSize: 256, parts: 6 },
    }).single('file')(req, res, (err: unknown) => {
      if (!err) return next();
      if (err instanceof multer.MulterError && err.code === 'LIMIT_FILE_SIZE') {
        return next(
          new FileReadError(`The log is larger than ${logs.MAX_LOG_BYTES / 1024 / 1024} MB`, 'too_large'),
        );
      }
      next(new DomainError('validation_failed', `The upload was refused: ${(err as Error).message}`));
    });
  };

const previewFieldsSchema = z.object({ prescriptionId: idSchema, planterId: idSchema.optional() });
const listQuerySchema = z.object({
  fieldId: idSchema.optional(),
  seasonId: idSchema.optional(),
  growerId: idSchema.optional(),
});
const recleanSchema = z.object({
  version: versionSchema,
  cleaning: cleaningSettingsSchema,
  bandFraction: z
    .number()
    .min(0.01, 'The band must be at least ±1 %')
    .max(0.5, 'The band must be at most ±50 %')
    .default(0.15),
});
const tileParamsSchema = z.object({
  id: idSchema,
  z: z.coerce.number().int().min(0).max(22),
  x: z.coerce.number().int().min(0),
  y: z.coerce.number().int().min(0),
});
const commentSchema = z.object({
  body: z.string().trim().min(1, 'Write something first').max(4000, 'At most 4 000 characters'),
});

/**
 * As-applied logs and their audits (DEVELOPERS.md "As-applied logs and the audit"). The farmer and the
 * office upload; everyone in scope reads and comments; the consultant signs off.
 */
export function logRouter(deps: { files: FileStore; enqueue: logs.Enqueue; mailer: Mailer; appUrl: string }) {
  const router = Router();
  const uploaders = requireRole('admin', 'agronomist', 'farmer');
  const notify = auditNotifier(deps.mailer, deps.appUrl);
  router.use(requireSignIn);

  router.post(
    '/preview',
    uploaders,
    uploadTo(deps.files),
    handle({}, async ({ req }) => {
      const received = req.file as (Express.Multer.File & ReceivedFile) | undefined;
      try {
        const fields = previewFieldsSchema.safeParse(req.body ?? {});
        if (!fields.success)
          throw new ValidationError('Choose the prescription the field was planted with', [
            { path: ['prescriptionId'], message: 'Required' },
          ]);
        if (!received)
          throw new ValidationError('Attach the log file', [{ path: ['file'], message: 'No file' }]);
        return await logs.previewLog(actorOf(req), deps.files, {
          prescriptionId: fields.data.prescriptionId,
          planterId: fields.data.planterId ?? null,
          fileName: received.originalname,
          file: received,
        });
      } finally {
        // Adopted files have moved; anything else received for a refused upload goes.
        if (received) await deps.files.discard(received.tmp);
      }
    }),
  );
  router.post(
    '/',
    uploaders,
    handle({ body: createLogSchema }, async ({ req, res, body }) => {
      const { log, created } = await logs.createLog(actorOf(req), body, deps.enqueue);
      res.status(created ? 201 : 200).json(log);
    }),
  );
  router.get(
    '/',
    handle({ query: listQuerySchema }, ({ req, query }) => logs.listLogs(actorOf(req), query)),
  );
  router.get(
    '/:id',
    handle({ params: idParamsSchema }, ({ req, params }) => logs.getLog(actorOf(req), params.id)),
  );
  router.post(
    '/:id/clean',
    requireRole('admin', 'agronomist', 'farmer'),
    handle({ params: idParamsSchema, body: recleanSchema }, ({ req, params, body }) =>
      logs.recleanLog(actorOf(req), params.id, body, deps.enqueue),
    ),
  );
  router.delete(
    '/:id',
    requireRole('admin', 'agronomist'),
    handle({ params: idParamsSchema }, async ({ req, res, params }) => {
      await logs.deleteLog(actorOf(req), params.id);
      res.status(204).end();
    }),
  );
  router.get(
    '/:id/tiles/:z/:x/:y',
    handle({ params: tileParamsSchema }, async ({ req, res, params }) => {
      const tile = await logTile(actorOf(req), params.id, params.z, params.x, params.y);
      res.set('Content-Type', 'application/vnd.mapbox-vector-tile');
      res.set('Cache-Control', 'private, max-age=60');
      res.send(tile);
    }),
  );
  router.get(
    '/:id/audit',
    handle({ params: idParamsSchema }, ({ req, params }) => audits.getAudit(actorOf(req), params.id)),
  );
  router.get(
    '/:id/audit/zones.csv',
    handle({ params: idParamsSchema }, async ({ req, res, params }) => {
      const actor = actorOf(req);
      const log = await logs.getLog(actor, params.id);
      sendFile(res, {
        body: await audits.auditCsv(actor, params.id, await unitSystemOf(actor)),
        contentType: 'text/csv; charset=utf-8',
        fileName: `${safeFileName([log.fieldName, log.seasonLabel, 'audit'])}.csv`,
      });
    }),
  );
  router.post(
    '/:id/audit/comments',
    handle({ params: idParamsSchema, body: commentSchema }, async ({ req, res, params, body }) => {
      res.status(201).json(await audits.addComment(actorOf(req), params.id, body.body));
    }),
  );
  router.post(
    '/:id/audit/sign-off',
    requireRole('admin', 'consultant'),
    handle({ params: idParamsSchema, body: z.object({ version: versionSchema }) }, ({ req, params, body }) =>
      audits.signOff(actorOf(req), params.id, body.version, notify),
    ),
  );
  // Errors of reading a file (unreadable, too large) keep the statuses the import routes give.
  router.use(importErrors);
  return router;
}
