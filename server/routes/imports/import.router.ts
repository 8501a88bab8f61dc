import { Router, type ErrorRequestHandler, type RequestHandler } from 'express';
import multer from 'multer';
import { idParamsSchema } from '../../../shared/schemas/common.schema';
import { chooseCoordinatesSchema, importRequestSchema } from '../../../shared/schemas/import.schema';
import { DomainError } from '../../errors';
import { actorOf, handle } from '../../middleware/handle';
import { requireRole, requireSignIn } from '../../middleware/authenticate';
import { FileReadError, IMPORT_ERROR_STATUS } from './import-errors';
import { MAX_UPLOAD_BYTES, chooseImportCoordinates, createImport, getImportPreview } from './import.service';

/** Multipart with one file held in memory, never more than the limit (multer stops counting there: 413). */
const upload: RequestHandler = (req, res, next) => {
  multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: MAX_UPLOAD_BYTES, files: 1, fields: 8, fieldSize: 4096, parts: 10 },
  }).single('file')(req, res, (err: unknown) => {
    if (!err) return next();
    if (err instanceof multer.MulterError) {
      if (err.code === 'LIMIT_FILE_SIZE') {
        return next(
          new FileReadError(`The file is larger than ${MAX_UPLOAD_BYTES / 1024 / 1024} MB`, 'too_large'),
        );
      }
      return next(
        new DomainError('validation_failed', `The upload was refused: ${err.message}`, [
          { path: [err.field ?? 'file'], message: err.message },
        ]),
      );
    }
    next(new DomainError('validation_failed', 'The upload could not be read as a multipart form'));
  });
};

/** The import codes' statuses (422 unreadable file, 413 too large); everything else goes on to the app's handler. */
export const importErrors: ErrorRequestHandler = (err, _req, res, next) => {
  const status = err instanceof DomainError ? IMPORT_ERROR_STATUS[err.code] : undefined;
  if (!status || res.headersSent) return next(err);
  res.status(status).json({ error: { code: err.code, message: err.message, details: err.details } });
};

/** POST /api/imports, GET /api/imports/:id, POST /api/imports/:id/coordinates: admin and agronomist. */
export function importRouter() {
  const router = Router();
  router.use(requireSignIn, requireRole('admin', 'agronomist'));
  router.post(
    '/',
    upload,
    handle({}, async ({ req, res }) => {
      const input = importRequestSchema.parse(req.body ?? {});
      res.status(201).json(await createImport(actorOf(req), req.file, input));
    }),
  );
  router.get(
    '/:id',
    handle({ params: idParamsSchema }, ({ req, params }) => getImportPreview(actorOf(req), params.id)),
  );
  router.post(
    '/:id/coordinates',
    handle({ params: idParamsSchema, body: chooseCoordinatesSchema }, ({ req, params, body }) =>
      chooseImportCoordinates(actorOf(req), params.id, body.code),
    ),
  );
  router.use(importErrors);
  return router;
}
