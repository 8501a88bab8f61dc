import type { NextFunction, Request, RequestHandler, Response } from 'express';
import type { z } from 'zod';
import type { Actor } from '../types';
import { UnauthenticatedError } from '../errors';

type Schemas = { body?: z.ZodType; query?: z.ZodType; params?: z.ZodType };
type Out<S, K extends keyof Schemas> =
  S extends Record<K, infer T extends z.ZodType> ? z.output<T> : undefined;

export type HandlerContext<S extends Schemas> = {
  body: Out<S, 'body'>;
  query: Out<S, 'query'>;
  params: Out<S, 'params'>;
  req: Request;
  res: Response;
};

/**
 * Wraps a route: parses body, query and params once with the shared zod schemas (a failure reaches the
 * error middleware as a 400 with a message per field), then calls `fn`. A returned value is sent as JSON;
 * `undefined` means the handler answered itself.
 */
export function handle<S extends Schemas>(
  schemas: S,
  fn: (ctx: HandlerContext<S>) => Promise<unknown> | unknown,
): RequestHandler {
  return async (req: Request, res: Response, next: NextFunction) => {
    try {
      const body = schemas.body ? schemas.body.parse(req.body ?? {}) : undefined;
      const query = schemas.query ? schemas.query.parse(singleValued(req.query)) : undefined;
      const params = schemas.params ? schemas.params.parse(req.params) : undefined;
      const result = await fn({ body, query, params, req, res } as HandlerContext<S>);
      if (result !== undefined && !res.headersSent) res.json(result);
    } catch (err) {
      next(err);
    }
  };
}

/** Duplicated query parameters are ignored beyond the first, never turned into arrays (ASVS 15.3.7). */
function singleValued(query: Request['query']): Record<string, string> {
  const out: Record<string, string> = Object.create(null);
  for (const [k, v] of Object.entries(query)) {
    if (k === '__proto__' || k === 'constructor' || k === 'prototype') continue;
    const first = Array.isArray(v) ? v[0] : v;
    if (typeof first === 'string') out[k] = first;
  }
  return { ...out };
}

export function actorOf(req: Request): Actor {
  if (!req.actor) throw new UnauthenticatedError();
  return req.actor;
}
