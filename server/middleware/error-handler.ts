import type { ErrorRequestHandler } from 'express';
import { ZodError } from 'zod';
import {
  ForeignKeyConstraintError,
  OptimisticLockError,
  UniqueConstraintError,
  ValidationError as SequelizeValidationError,
} from 'sequelize';
import { DomainError } from '../errors';
import { GeoInputError } from '../../shared/geo/geo-input-error';

const STATUS: Record<string, number> = {
  not_found: 404,
  unauthenticated: 401,
  invalid_credentials: 401,
  forbidden: 403,
  csrf: 403,
  conflict: 409,
  duplicate: 409,
  in_use: 409,
  stale: 409,
  frozen: 409,
  check_not_accepted: 409,
  not_approved: 409,
  draft_exists: 409,
  busy: 409,
  validation_failed: 400,
  invalid_geometry: 422,
  unreadable_file: 422,
  coordinates_unknown: 422,
  unknown_crs: 422,
  geo_input: 422,
  too_large: 413,
  gone: 410,
};

const UNIQUE_MESSAGES: Record<string, { path: string; message: string }> = {
  growers_name_unique: { path: 'name', message: 'A grower with this name already exists' },
  farms_name_unique: { path: 'name', message: 'This grower already has a farm with this name' },
  fields_name_unique: { path: 'name', message: 'This farm already has a field with this name' },
  crop_seasons_unique: { path: 'crop', message: 'This field already has this crop in this year' },
  planters_name_unique: { path: 'name', message: 'This grower already has a planter with this name' },
  users_email_unique: { path: 'email', message: 'This e-mail already has an account' },
};

/** The one error middleware: domain, zod and Sequelize errors become `{ error: { code, message, details } }`. */
export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  if (res.headersSent) return;
  if (err instanceof ZodError) {
    const details = err.issues.map((i) => ({
      path: i.path.map((p) => (typeof p === 'symbol' ? String(p) : p)),
      message: i.message,
    }));
    const first = details[0];
    res.status(400).json({
      error: {
        code: 'validation_failed',
        message: first
          ? `${first.path.join('.') || 'request'}: ${first.message}`
          : 'The request is not valid',
        details,
      },
    });
    return;
  }
  if (err instanceof GeoInputError) {
    // Pure geometry code refuses input it cannot work with; the message names the place.
    res.status(422).json({ error: { code: 'invalid_geometry', message: err.message } });
    return;
  }
  if (err instanceof DomainError) {
    res
      .status(STATUS[err.code] ?? 400)
      .json({ error: { code: err.code, message: err.message, details: err.details } });
    return;
  }
  if (err instanceof OptimisticLockError) {
    res.status(409).json({
      error: { code: 'stale', message: 'Someone else changed this record: reload it and try again' },
    });
    return;
  }
  if (err instanceof UniqueConstraintError) {
    const constraint = (err.parent as { constraint?: string } | undefined)?.constraint ?? '';
    const known = UNIQUE_MESSAGES[constraint];
    res.status(409).json({
      error: {
        code: 'duplicate',
        message: known?.message ?? 'A record like this already exists',
        details: known ? [{ path: [known.path], message: known.message }] : undefined,
      },
    });
    return;
  }
  if (err instanceof ForeignKeyConstraintError) {
    res.status(409).json({ error: { code: 'in_use', message: 'Other records still refer to this one' } });
    return;
  }
  if (err instanceof SequelizeValidationError) {
    res.status(400).json({ error: { code: 'validation_failed', message: err.message } });
    return;
  }
  const e = err as { type?: string; status?: number; message?: string };
  if (e?.type === 'entity.parse.failed') {
    res.status(400).json({ error: { code: 'bad_json', message: 'The request body is not valid JSON' } });
    return;
  }
  if (e?.type === 'entity.too.large' || e?.status === 413) {
    res.status(413).json({ error: { code: 'too_large', message: 'The request body is too large' } });
    return;
  }
  console.warn(`[api] ${req.method} ${req.originalUrl} failed:`, err);
  res.status(500).json({
    error: {
      code: 'internal',
      message: 'Something went wrong on our side. Try again; if it keeps happening, tell your admin',
    },
  });
};
